"use client";

import { buttonClasses } from "@/components/ui/Button";

/** Saves a CSV built in the browser through a Blob link; nothing goes to the server. */
export function DownloadCsvButton({
  build,
  fileName,
  label,
}: {
  /** The file's text, built on click. */
  build: () => string;
  fileName: string;
  /** What the button downloads, for assistive technology. */
  label: string;
}) {
  const download = () => {
    const blob = new Blob([build()], { type: "text/csv;charset=utf-8" });
    const url = URL.createObjectURL(blob);
    const a = document.createElement("a");
    a.href = url;
    a.download = fileName;
    document.body.appendChild(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 1000);
  };
  return (
    <button
      type="button"
      onClick={download}
      className={buttonClasses("secondary", "print:hidden")}
      aria-label={label}
    >
      Download CSV
    </button>
  );
}
