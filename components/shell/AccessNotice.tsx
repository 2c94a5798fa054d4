import Link from "next/link";
import { buttonClasses } from "@/components/ui/Button";
import { IconInfo, IconWarning } from "@/components/ui/icons";

const NOTICES = {
  forbidden: {
    title: "Not available to your role",
    text: "This page belongs to another role. If you need it for your work, ask an administrator to review your access.",
  },
  "not-found": {
    title: "Not found",
    text: "There is nothing here, or it belongs to a unit you are not assigned to.",
  },
} as const;

/** The 403 and 404 pages' body: inside the app's header when signed in, bare otherwise. */
export function AccessNotice({ kind }: { kind: keyof typeof NOTICES }) {
  const notice = NOTICES[kind];
  const Icon = kind === "forbidden" ? IconWarning : IconInfo;
  return (
    <div className="mx-auto flex min-h-[60vh] max-w-md flex-col items-center justify-center gap-3 px-4 text-center">
      <Icon className={`text-3xl ${kind === "forbidden" ? "text-overdue" : "text-ink-muted"}`} />
      <h1 className="text-xl font-semibold">{notice.title}</h1>
      <p className="text-sm text-ink-muted">{notice.text}</p>
      <Link href="/board" className={buttonClasses("secondary")}>
        Back to the Board
      </Link>
    </div>
  );
}
