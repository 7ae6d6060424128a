/**
 * POST /api/studies/:id/balance: the fetcher and its mutation hook (the request is aborted on cancel).
 * It asks for the streamed mode (newline-delimited JSON): progress lines go to `onProgress` while the
 * server works, the last line carries the answer or the error. A plain JSON answer (an error found
 * before streaming began) is read as the API client reads it.
 */
import { useMutation } from '@tanstack/react-query';
import { BALANCE_STREAM_TYPE, type BalanceProgress, type BalanceRequest, type BalanceResponse } from '../../../../shared/api/balancing.ts';
import { ApiError, responseError } from '../../../lib/api-client.ts';

type StreamLine = { progress: BalanceProgress } | { result: BalanceResponse } | { error: { code: string; message: string } };

const BROKEN = 'The connection to the server broke off before the balancing finished. Try again.';

export async function runBalance(studyId: string, body: BalanceRequest, signal?: AbortSignal, onProgress?: (p: BalanceProgress) => void): Promise<BalanceResponse> {
  let res: Response;
  try {
    res = await fetch(`/api/studies/${encodeURIComponent(studyId)}/balance`, {
      method: 'POST',
      headers: { Accept: `${BALANCE_STREAM_TYPE}, application/json`, 'Content-Type': 'application/json' },
      credentials: 'same-origin',
      body: JSON.stringify(body),
      signal,
    });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiError(0, { code: 'network', message: 'Cannot reach the Wyeward server. Check the connection and try again.' }, null);
  }
  if (!(res.headers.get('Content-Type') ?? '').startsWith(BALANCE_STREAM_TYPE) || !res.body) {
    const text = await res.text();
    let parsed: unknown = null;
    try {
      parsed = text ? JSON.parse(text) : null;
    } catch {
      parsed = text;
    }
    if (!res.ok) throw responseError(res, parsed);
    return parsed as BalanceResponse;
  }
  const reader = res.body.pipeThrough(new TextDecoderStream()).getReader();
  let buffered = '';
  const read = (line: string): BalanceResponse | undefined => {
    if (!line.trim()) return undefined;
    const l = JSON.parse(line) as StreamLine;
    if ('progress' in l) onProgress?.(l.progress);
    else if ('error' in l) throw new ApiError(res.status, { code: l.error.code, message: l.error.message }, l);
    else if ('result' in l) return l.result;
    return undefined;
  };
  for (;;) {
    let chunk: ReadableStreamReadResult<string>;
    try {
      chunk = await reader.read();
    } catch (cause) {
      if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
      throw new ApiError(0, { code: 'network', message: BROKEN }, null);
    }
    if (chunk.done) break;
    buffered += chunk.value;
    let nl: number;
    while ((nl = buffered.indexOf('\n')) >= 0) {
      const result = read(buffered.slice(0, nl));
      buffered = buffered.slice(nl + 1);
      if (result) {
        void reader.cancel().catch(() => {});
        return result;
      }
    }
  }
  const result = read(buffered);
  if (result) return result;
  throw new ApiError(0, { code: 'network', message: BROKEN }, null);
}

export function useRunBalance(studyId: string) {
  return useMutation({
    mutationFn: ({ body, signal, onProgress }: { body: BalanceRequest; signal: AbortSignal; onProgress?: (p: BalanceProgress) => void }) => runBalance(studyId, body, signal, onProgress),
  });
}
