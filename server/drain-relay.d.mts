import type { IncomingMessage, ServerResponse } from "node:http";
export function oneDrainListenerPerWait(request: IncomingMessage, response: ServerResponse, next: () => void): void;
