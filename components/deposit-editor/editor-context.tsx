"use client";

import { createContext, useContext } from "react";

export interface EditorContextValue {
  readOnly: boolean;
  /** Messages shown beside the input at `pointer`. */
  messagesFor: (pointer: string) => string[];
  /** Forget the server's problems at or inside `pointer` (called when that input changes). */
  clearErrors: (pointer: string) => void;
}

const EditorContext = createContext<EditorContextValue>({ readOnly: true, messagesFor: () => [], clearErrors: () => {} });

export const EditorContextProvider = EditorContext.Provider;

export function useEditorContext(): EditorContextValue {
  return useContext(EditorContext);
}
