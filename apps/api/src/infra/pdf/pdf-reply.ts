/**
 * What every PDF route does around the renderer: refuse at once with 503 and Retry-After when the queue is full
 * (before any costly preparation), the same when the wait for a page runs out, and cancel the work when the client
 * goes away (taken out of the queue, or its page closed mid-render).
 */
import type { FastifyReply } from 'fastify';
import { ProblemError } from '../http/problem';
import { PdfBusyError, PdfCancelledError, type PdfRenderer } from './browser-pool';

export const pdfBusy = (retryAfter: number, note = '') =>
  new ProblemError(503, 'PDF rendering busy', `every PDF page is in use and the queue is full; try again in ${retryAfter} s${note}`, { retryAfter });

/** Throws the 503 when a request arriving now would find the PDF queue full. */
export function refuseWhenPdfQueueFull(pdf: PdfRenderer, note = ''): void {
  if (pdf.full) throw pdfBusy(pdf.retryAfterSeconds(), note);
}

/**
 * Runs one PDF job for a reply: `job` gets a signal that aborts when the client's connection closes before the
 * answer is written. A full queue or a wait that ran out answers 503 with Retry-After; a cancelled job 499.
 */
export async function pdfForReply<T>(reply: FastifyReply, job: (signal: AbortSignal) => Promise<T>, note = ''): Promise<T> {
  const abandoned = new AbortController();
  const onClose = () => {
    if (!reply.raw.writableEnded) abandoned.abort();
  };
  reply.raw.once('close', onClose);
  try {
    return await job(abandoned.signal);
  } catch (err) {
    if (err instanceof PdfBusyError) throw pdfBusy(err.retryAfterSeconds, note);
    if (err instanceof PdfCancelledError) throw new ProblemError(499, 'Client closed request', 'the PDF was not rendered: the client disconnected');
    throw err;
  } finally {
    reply.raw.off('close', onClose);
  }
}
