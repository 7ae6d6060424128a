/**
 * A request's validation problems in the words of the form people filled in: "Study name: is
 * missing", "Role: must be one of Owner, Engineer, Reviewer, Viewer", "element LOAD3: every phase ›
 * P (kW) must be a number", never a schema path (`layout.nodes.3`, `content.circuit.format`) or a
 * validator's phrasing ("Invalid input: expected number, received string"). The error middleware
 * (error-handler.ts) says every zod error through here: the top message and each field's message.
 * The `fields` keys stay paths: they are addresses the client uses to place a message at its field.
 */
import type { z } from 'zod';
import { circuitIssueWords, issueMessageWords } from '../shared/review/circuit-issues.ts';

/** Where a request's field is shown, by its key; a resource's own names come first (`studies:name` is the study's name). */
const LABELS: Record<string, string> = {
  'studies:name': 'Study name',
  'studies:message': 'Revision message',
  'studies:body': 'Comment',
  'studies:description': 'Description',
  'auth:name': 'Your name',
  'team:name': 'Name',
  name: 'Name',
  teamName: 'Team name',
  email: 'E-mail',
  password: 'Password',
  role: 'Role',
  body: 'Text',
  message: 'Message',
  description: 'Description',
  action: 'Review action',
  acknowledgeViolations: 'Acknowledgement of the violations',
  reviewers: 'Reviewers',
  revision: 'Revision',
  from: 'From revision',
  to: 'To revision',
  page: 'Page',
  pageSize: 'Page size',
  limit: 'Number of items',
  offset: 'Start of the list',
  sort: 'Sort order',
  dir: 'Sort direction',
  q: 'Filter',
  template: 'Templates only',
  isTemplate: 'Template',
  content: 'Study content',
  layout: 'Diagram layout',
  nodes: 'shape',
  edges: 'wire',
  viewport: 'view',
  settings: 'Study settings',
  cases: 'Study case',
  case: 'Study case',
  units: 'Units',
  customersCsv: 'Customer CSV',
  objective: 'Objective',
  weights: 'Weights',
  definition: 'Unbalance definition',
  bus: 'Bus',
  maxMoves: 'Most moves',
  moves: 'Moves',
  parameters: 'Sweep parameter',
  outputs: 'Recorded output',
  points: 'Points',
  anchor: 'Pinned to',
  parentId: 'Reply to',
  mentions: 'Mentions',
  resolved: 'Resolved',
  read: 'Read',
  fileName: 'File name',
  contentType: 'File type',
  inviteToken: 'Invitation link',
  token: 'Link',
};

/** Whole sentences for fields a person never fills in: they say what went wrong and what to do. */
const SENTENCES: Record<string, string> = {
  version: 'The page did not say which saved state of the study it changes; reload the page and try again.',
};

/** `customerCount` → "Customer count". */
function words(key: string): string {
  const w = key.replace(/([a-z0-9])([A-Z])/g, '$1 $2').replace(/[_-]+/g, ' ').toLowerCase().trim();
  return w ? w[0].toUpperCase() + w.slice(1) : 'A value';
}

/** The resource a route serves (`/api/studies/…` → "studies"), for resource-specific labels. */
function resourceOf(url: string | undefined): string {
  return /^\/api\/([a-z-]+)/.exec(url ?? '')?.[1] ?? '';
}

/** "Study name", "Diagram layout › shape 4", "Reviewers › item 2". */
function labelOf(path: readonly PropertyKey[], resource: string): string {
  const parts: string[] = [];
  // A study's content is a wrapper people never see: its layout is "Diagram layout", its settings "Study settings".
  if (path.length > 1 && path[0] === 'content') return labelOf(path.slice(1), resource);
  for (const [i, seg] of path.entries()) {
    if (typeof seg === 'number') {
      const last = parts.pop();
      // A list's entry: "shape 4" when the list names its items, else "item 4" under the list's name.
      const item = typeof path[i - 1] === 'string' && LABELS[path[i - 1] as string] && /^[a-z]/.test(LABELS[path[i - 1] as string]) ? last : undefined;
      if (item) parts.push(`${item} ${seg + 1}`);
      else {
        if (last !== undefined) parts.push(last);
        parts.push(`item ${seg + 1}`);
      }
      continue;
    }
    const key = String(seg);
    const label = (i === 0 ? LABELS[`${resource}:${key}`] : undefined) ?? LABELS[key] ?? words(key);
    parts.push(i === 0 ? label[0].toUpperCase() + label.slice(1) : label);
  }
  return parts.join(' › ');
}

/** A zod path as the engine writes circuit paths (`elements[0].phases.a.kw`). */
function enginePath(path: readonly PropertyKey[]): string {
  return path.map((s, i) => (typeof s === 'number' ? `[${s}]` : `${i > 0 ? '.' : ''}${String(s)}`)).join('');
}

/** The circuit a request carried, to name its elements as drawn. */
function circuitOf(body: unknown, at: readonly PropertyKey[]): unknown {
  let v: unknown = body;
  for (const k of at) v = v && typeof v === 'object' ? (v as Record<PropertyKey, unknown>)[k as string] : undefined;
  return v;
}

/** A choice out of a list: the choices when they are plain words ("owner", "request-changes"), else no list of internal names. */
function choiceWords(issue: z.core.$ZodIssue): string | null {
  // Only in place of the validator's own phrasing: a message written for people is kept.
  if (issue.code !== 'invalid_value' || issue.values.length < 2 || !/^Invalid option/.test(issue.message)) return null;
  const plain = issue.values.every((v) => typeof v === 'string' && /^[a-z]+(-[a-z]+)*$/.test(v));
  return plain ? `must be one of ${issue.values.map((v) => String(v).replace(/-/g, ' ')).join(', ')}` : 'is not one of the choices offered';
}

/** One problem: where (`label`, empty for the whole request) and what (`text`, beside the field). */
export interface IssueWords {
  label: string;
  text: string;
  /** The whole message for a person reading it away from the field. */
  message: string;
}

/** One zod issue of a request to `url` with `body`, in words. */
export function issueWords(issue: z.core.$ZodIssue, url?: string, body?: unknown): IssueWords {
  return problemWords(issue.path, issue.message, url, body, choiceWords(issue));
}

/** A problem the input boundary found at a dotted path (`content.layout.nodes.3.label`), in words. */
export function fieldWords(field: string, message: string, url?: string): IssueWords {
  const path = field === '_' || field === '' ? [] : field.split('.').map((s) => (/^\d+$/.test(s) ? Number(s) : s));
  return problemWords(path, message.replace(/\.$/, ''), url, undefined, null);
}

function problemWords(path: readonly PropertyKey[], raw: string, url: string | undefined, body: unknown, choice: string | null): IssueWords {
  const issue = { message: raw };
  const text = choice ?? (/^Invalid input$/.test(raw) ? 'is not valid' : issueMessageWords(raw));
  // A circuit inside the request (a study's content): name its elements and parameters as drawn.
  const at = path.indexOf('circuit');
  if (at >= 0 && path.slice(0, at).every((s) => typeof s === 'string')) {
    const circuit = circuitOf(body, path.slice(0, at + 1));
    const rest = path.slice(at + 1);
    const said = rest.length === 0 ? `The circuit ${/^(is|has|must|needs|does) /.test(text) ? text : `is not valid: ${text}`}` : `In the circuit, ${circuitIssueWords(circuit, { path: enginePath(rest), message: choice ?? issue.message })}`;
    return { label: 'Circuit', text: said, message: said };
  }
  const key = path.length > 0 ? String(path[path.length - 1]) : '';
  if (path.length === 1 && SENTENCES[key]) return { label: '', text: SENTENCES[key], message: SENTENCES[key] };
  if (path.length === 0) {
    const sentence = /^[A-Z]/.test(text) ? text : `The request ${text}`;
    return { label: '', text: sentence, message: sentence };
  }
  const label = labelOf(path, resourceOf(url));
  // A message that starts with its own key ("revision must be a whole number") says it with the label.
  if (text.startsWith(`${key} `)) {
    const said = `${label}${text.slice(key.length)}`;
    return { label, text: said, message: said };
  }
  // A message written for people ("Name is required", "Enter a valid e-mail address") stands alone beside its field.
  const own = /^[A-Z]/.test(text);
  const mentions = own && label.split(' › ').pop()!.toLowerCase().split(' ').some((w) => w.length > 2 && text.toLowerCase().includes(w));
  const message = mentions ? text : `${label}${/^(is|has|must|needs|does) /.test(text) ? ' ' : ': '}${text}`;
  return { label, text: own ? text : `${label.split(' › ').pop()} ${text}`.replace(/^./, (c) => c.toUpperCase()), message };
}
