/**
 * An audit event's detail as a sentence people read: member names instead of user ids, study
 * names instead of study ids, revision numbers, comment anchors in the words of the diagram, and
 * never JSON or an id. Pure: the caller looks the names up (audit.ts).
 */
import { AUDIT_ACTION_WORDS } from '../../shared/api/audit.ts';
import { anchorWords, joinWords, type CircuitNames } from '../../shared/review/user-names.ts';

export interface AuditNames {
  /** A member's name by user id (removed members included). */
  user(id: string): string | undefined;
  /** A study's name by id (deleted studies included). */
  study(id: string): string | undefined;
  /** The names of the event's study circuit as drawn (for comment anchors), when known. */
  circuit?: CircuitNames;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

const STATUS_WORDS: Record<string, string> = { draft: 'draft', 'in-review': 'in review', 'changes-requested': 'changes requested', approved: 'approved' };

function quoted(s: unknown): string {
  return typeof s === 'string' && s !== '' ? `“${s}”` : 'a study';
}

function kB(bytes: unknown): string {
  if (typeof bytes !== 'number' || !Number.isFinite(bytes)) return '';
  return bytes < 1024 ? `${bytes} bytes` : bytes < 1024 * 1024 ? `${(bytes / 1024).toFixed(0)} kB` : `${(bytes / 1024 / 1024).toFixed(1)} MB`;
}

/** The label of a key in the fallback sentence: "someKey" → "some key". */
function keyWords(k: string): string {
  return k.replace(/Id$/, '').replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase();
}

/** Any value in words, ids resolved to names or left out: never JSON, never a UUID. */
function valueWords(v: unknown, names: AuditNames): string {
  if (v === null || v === undefined) return '—';
  if (typeof v === 'string') {
    if (UUID.test(v)) return names.user(v) ?? names.study(v) ?? 'a removed record';
    return v;
  }
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  if (typeof v === 'number') return String(v);
  if (Array.isArray(v)) return joinWords(v.map((x) => valueWords(x, names)));
  if (isRecord(v)) return Object.entries(v).map(([k, x]) => `${keyWords(k)} ${valueWords(x, names)}`).join(', ');
  return String(v);
}

/** The generic sentence for a detail this module has no words for: "key value · …", ids left out or named. */
function fallback(d: Record<string, unknown>, names: AuditNames): string {
  return Object.entries(d)
    .filter(([k, v]) => k !== 'seeded' && !(typeof v === 'string' && UUID.test(v) && !names.user(v) && !names.study(v)))
    .map(([k, v]) => `${keyWords(k)}: ${valueWords(v, names)}`)
    .join(' · ');
}

/** The event's detail in words ("revision 2 sent for review to Dilys Arkwright"). */
export function auditText(action: string, detail: unknown, names: AuditNames): string {
  const d = isRecord(detail) ? detail : {};
  const who = (id: unknown) => (typeof id === 'string' ? (names.user(id) ?? 'a former member') : 'a member');
  const rev = typeof d.revision === 'number' ? `revision ${d.revision}` : 'the study';
  const seeded = d.seeded === true ? ' (demo data)' : '';
  const sentence = ((): string => {
    switch (action) {
      case 'user.sign-up':
        return `signed up as ${String(d.email ?? 'a new member')}${d.teamCreated ? ' and created the team' : ''}`;
      case 'invite.create':
        return `invited ${String(d.email ?? 'someone')} as ${String(d.role ?? 'a member')}`;
      case 'invite.revoke':
        return `withdrew the invitation of ${String(d.email ?? 'someone')}`;
      case 'invite.accept':
        return `accepted an invitation as ${String(d.role ?? 'a member')}`;
      case 'member.role':
        return `${who(d.userId)}: role ${String(d.from ?? '—')} → ${String(d.to ?? '—')}`;
      case 'member.remove':
        return `removed ${who(d.userId)} (${String(d.role ?? 'member')}) from the team`;
      case 'study.create':
        return `created ${quoted(d.name)}`;
      case 'study.import':
        return `imported ${quoted(d.name)} from a ${d.format === 'wyeward-circuit' ? 'circuit' : 'study'} file`;
      case 'study.update': {
        const fields = Array.isArray(d.fields) ? d.fields.filter((f): f is string => typeof f === 'string') : [];
        const words = fields.map((f) => (f === 'content' ? 'the circuit' : `the ${f}`));
        return words.length > 0 ? `changed ${joinWords(words)}` : 'changed the study';
      }
      case 'study.delete':
        return `deleted ${quoted(d.name)}`;
      case 'study.clone': {
        const source = typeof d.sourceName === 'string' ? d.sourceName : typeof d.sourceId === 'string' ? names.study(d.sourceId) : undefined;
        const from = `${quoted(source)}${typeof d.sourceRevision === 'number' ? `, revision ${d.sourceRevision}` : ''}`;
        return d.fromTemplate ? `started from the template ${from}` : `copied from ${from}`;
      }
      case 'study.template':
        return d.isTemplate ? 'marked as a template' : `no longer a template${d.reason === 'content edited' ? ' (its circuit was edited)' : ''}`;
      case 'study.export':
        return `exported ${rev} to a file`;
      case 'revision.create':
        return `saved ${rev}${d.solved === false ? ' (it does not solve)' : ''}`;
      case 'revision.restore':
        return `saved ${rev}, restoring revision ${String(d.restoredFrom ?? '—')}`;
      case 'review.request': {
        const reviewers = Array.isArray(d.reviewers) ? d.reviewers.map(who) : [];
        return `asked ${reviewers.length > 0 ? joinWords(reviewers) : 'the team'} to review ${rev}`;
      }
      case 'review.approve': {
        const ack = typeof d.violations === 'number' && d.violations > 0 ? `, acknowledging ${d.violations} violation${d.violations === 1 ? '' : 's'}` : '';
        return `approved ${rev}${ack}`;
      }
      case 'review.request-changes':
        return `requested changes to ${rev}`;
      case 'review.reset': {
        const was = typeof d.fromStatus === 'string' ? (STATUS_WORDS[d.fromStatus] ?? d.fromStatus) : 'reviewed';
        return `edited in ${rev}: back to draft from ${was}${typeof d.approvedRevision === 'number' ? ` (the approval of revision ${d.approvedRevision} stays on record)` : ''}`;
      }
      case 'comment.create': {
        const on = isRecord(d.anchor) && (('elementId' in d.anchor && typeof d.anchor.elementId === 'string') || ('resultRow' in d.anchor && isRecord(d.anchor.resultRow)))
          ? ` on ${anchorWords(d.anchor as Parameters<typeof anchorWords>[0], names.circuit)}`
          : '';
        return d.parentId ? 'replied to a comment' : `commented${on}`;
      }
      case 'comment.edit':
        return 'edited a comment';
      case 'comment.delete':
        return typeof d.authorId === 'string' ? `deleted a comment by ${who(d.authorId)}` : 'deleted a comment';
      case 'comment.resolve':
        return 'resolved a thread';
      case 'comment.reopen':
        return 'reopened a thread';
      case 'attachment.upload':
        return `attached “${String(d.fileName ?? 'a file')}”${kB(d.size) ? ` (${kB(d.size)})` : ''}`;
      case 'attachment.delete':
        return `removed the attachment “${String(d.fileName ?? 'a file')}”`;
      default:
        return fallback(d, names);
    }
  })();
  return `${sentence}${seeded}`;
}

/** An action in words ("review requested"); an unknown action as written. */
export function actionWords(action: string): string {
  return (AUDIT_ACTION_WORDS as Record<string, string>)[action] ?? action;
}
