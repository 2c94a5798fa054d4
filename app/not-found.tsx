import Link from "next/link";
import { buttonClasses } from "@/components/ui/Button";
import { IconInfo } from "@/components/ui/icons";

export default function NotFound() {
  return (
    <main className="mx-auto flex min-h-[60vh] max-w-md flex-col items-center justify-center gap-3 px-4 text-center">
      <IconInfo className="text-3xl text-ink-muted" />
      <h1 className="text-xl font-semibold">Not found</h1>
      <p className="text-sm text-ink-muted">
        There is nothing here, or it belongs to a unit you are not assigned to.
      </p>
      <Link href="/board" className={buttonClasses("secondary")}>
        Back to the Board
      </Link>
    </main>
  );
}
