import * as RadixToast from "@radix-ui/react-toast";
import { createContext, useCallback, useContext, useState, type ReactNode } from "react";
import { cx } from "./cx";

type ToastTone = "info" | "success" | "error";
type ToastMessage = { id: number; title: string; description?: string; tone: ToastTone };

const ToastContext = createContext<(message: Omit<ToastMessage, "id">) => void>(() => {});

/** Short-lived notices ("Listing published"), announced politely to screen readers by Radix. */
export function ToastProvider({ children }: { children: ReactNode }) {
  const [messages, setMessages] = useState<ToastMessage[]>([]);
  const show = useCallback((message: Omit<ToastMessage, "id">) => {
    setMessages((current) => [...current, { ...message, id: Date.now() + Math.random() }]);
  }, []);
  return (
    <ToastContext.Provider value={show}>
      <RadixToast.Provider swipeDirection="right" duration={6000}>
        {children}
        {messages.map((message) => (
          <RadixToast.Root
            key={message.id}
            onOpenChange={(open) => {
              if (!open) setMessages((current) => current.filter((m) => m.id !== message.id));
            }}
            className={cx(
              "rounded-panel border bg-white p-4 shadow-lg",
              message.tone === "error" ? "border-beyond" : message.tone === "success" ? "border-within" : "border-ink-200",
            )}
          >
            <RadixToast.Title className="text-sm font-bold text-ink-900">{message.title}</RadixToast.Title>
            {message.description ? (
              <RadixToast.Description className="mt-1 text-sm text-ink-600">{message.description}</RadixToast.Description>
            ) : null}
          </RadixToast.Root>
        ))}
        <RadixToast.Viewport className="fixed bottom-4 right-4 z-50 flex w-[min(92vw,24rem)] flex-col gap-2 outline-none" />
      </RadixToast.Provider>
    </ToastContext.Provider>
  );
}

export function useToast() {
  return useContext(ToastContext);
}
