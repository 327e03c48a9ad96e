/** The "methods" note under every figure: how each number was computed, in plain words. */
export function MethodsNote({ methods }: { methods: string[] }) {
  return (
    <details className="mt-3 rounded border border-line bg-white p-2 text-xs print:block" open>
      <summary className="cursor-pointer font-semibold">Methods</summary>
      <ul className="mt-1 list-disc space-y-0.5 pl-5">
        {methods.map((m) => <li key={m}>{m}</li>)}
      </ul>
    </details>
  );
}

/** A short method in a tooltip beside a figure's heading (also readable by keyboard and screen reader). */
export function MethodTip({ text }: { text: string }) {
  return (
    <span className="ml-1 cursor-help text-xs font-normal text-muted underline decoration-dotted" title={text} tabIndex={0} aria-label={`Method: ${text}`}>
      method
    </span>
  );
}
