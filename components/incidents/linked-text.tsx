// Plain mail text with its web addresses made clickable; everything else stays text.
const URL_PATTERN = /(https?:\/\/[^\s<>"]+)/g;

export function LinkedText({ text }: { text: string }) {
  const parts = text.split(URL_PATTERN);
  return (
    <pre className="whitespace-pre-wrap break-words font-mono text-sm leading-relaxed">
      {parts.map((part, i) =>
        i % 2 === 1 ? (
          <a key={i} href={part} className="break-all text-accent-700 underline hover:text-accent-800">
            {part}
          </a>
        ) : (
          part
        ),
      )}
    </pre>
  );
}
