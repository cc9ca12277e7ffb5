import { useState } from "react";

/** Copies `text` to the clipboard and says so; the text stays selectable for browsers without clipboard access. */
export function CopyButton({ text, label = "Copy" }: { text: string; label?: string }) {
  const [state, setState] = useState<"idle" | "copied" | "failed">("idle");
  return (
    <button
      type="button"
      className="btn-quiet"
      onClick={() =>
        navigator.clipboard
          .writeText(text)
          .then(() => setState("copied"))
          .catch(() => setState("failed"))
      }
    >
      {state === "copied" ? "Copied" : state === "failed" ? "Select and copy by hand" : label}
    </button>
  );
}
