import Link from "next/link";
import { buttonClasses } from "@/components/ui/Button";
import { IconWarning } from "@/components/ui/icons";

export default function Forbidden() {
  return (
    <main className="mx-auto flex min-h-[60vh] max-w-md flex-col items-center justify-center gap-3 px-4 text-center">
      <IconWarning className="text-3xl text-overdue" />
      <h1 className="text-xl font-semibold">Not available to your role</h1>
      <p className="text-sm text-ink-muted">
        This page belongs to another role. If you need it for your work, ask an administrator to
        review your access.
      </p>
      <Link href="/board" className={buttonClasses("secondary")}>
        Back to the Board
      </Link>
    </main>
  );
}
