/**
 * Reads a Server-Sent Events body frame by frame (tests and benches; the browser has
 * EventSource). Calls `onFrame` with each frame's event name and its raw `data` line, and
 * resolves when the stream ends or the read fails (a cancelled stream is an end, not an error).
 */
export async function readSseFrames(body: ReadableStream<Uint8Array>, onFrame: (event: string, data: string | undefined) => void): Promise<void> {
  const reader = body.getReader();
  const decoder = new TextDecoder();
  let buffer = '';
  for (;;) {
    const { value, done } = await reader.read().catch(() => ({ value: undefined, done: true }));
    if (done) return;
    buffer += decoder.decode(value, { stream: true });
    let i: number;
    while ((i = buffer.indexOf('\n\n')) >= 0) {
      const chunk = buffer.slice(0, i);
      buffer = buffer.slice(i + 2);
      const event = /^event: (.*)$/m.exec(chunk)?.[1];
      if (event) onFrame(event, /^data: (.*)$/m.exec(chunk)?.[1]);
    }
  }
}
