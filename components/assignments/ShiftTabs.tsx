import Link from "next/link";

/** Current / next shift as links (Tab and Enter), the chosen one marked for screen readers too. */
export function ShiftTabs({ unitId, shift }: { unitId: number; shift: "current" | "next" }) {
  const item = (value: "current" | "next", label: string) => {
    const chosen = shift === value;
    return (
      <li>
        <Link
          href={`/assignments?unit=${unitId}&shift=${value}`}
          aria-current={chosen ? "page" : undefined}
          className={`inline-block rounded-md px-3 py-1.5 text-sm font-medium ${
            chosen
              ? "bg-accent text-on-accent"
              : "border border-border-strong bg-surface text-ink hover:bg-surface-muted"
          }`}
        >
          {label}
        </Link>
      </li>
    );
  };
  return (
    <nav aria-label="Shift">
      <ul className="flex gap-2">
        {item("current", "Current shift")}
        {item("next", "Next shift")}
      </ul>
    </nav>
  );
}
