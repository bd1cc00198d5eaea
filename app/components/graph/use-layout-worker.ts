// One layout worker for a graph view's lifetime: the newest request is posted, and an answer to an
// older one is dropped, so a layout that takes seconds at 500 steps never blocks typing and never
// lands on a network the text has moved past. A request equal (by `key`) to the last one asked is
// not posted again: a keystroke that leaves the network alone costs no layout.
import { useEffect, useRef, useState } from "react";

export interface LayoutRequest<Message> {
  /** Equal keys mean equal layouts. */
  key: string;
  message: Message;
}

export function useLayoutWorker<Message, Answer>(create: () => Worker, request: LayoutRequest<Message> | null): Answer | null {
  const [answer, setAnswer] = useState<Answer | null>(null);
  const worker = useRef<Worker | null>(null);
  const asked = useRef({ id: 0, key: "" });
  const createWorker = useRef(create);

  useEffect(() => {
    const created = createWorker.current();
    created.onmessage = (event: MessageEvent<{ id: number; answer: Answer }>) => {
      if (event.data.id === asked.current.id) setAnswer(event.data.answer);
    };
    worker.current = created;
    return () => {
      created.terminate();
      worker.current = null;
      // A worker made again (React's development double mount) is asked afresh.
      asked.current = { id: asked.current.id, key: "" };
    };
  }, []);

  useEffect(() => {
    if (!request || !worker.current || request.key === asked.current.key) return;
    asked.current = { id: asked.current.id + 1, key: request.key };
    worker.current.postMessage({ id: asked.current.id, message: request.message });
  }, [request]);

  return answer;
}

/** The worker's side: answers each message with `work(message)`, tagged with the request's id. */
export function answerLayoutRequests<Message, Answer>(work: (message: Message) => Answer) {
  self.onmessage = (event: MessageEvent<{ id: number; message: Message }>) => {
    self.postMessage({ id: event.data.id, answer: work(event.data.message) });
  };
}
