import { render, screen } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { StatusBadge, type Status } from "@/components/ui/StatusBadge";

describe("StatusBadge", () => {
  it.each<[Status, string]>([
    ["in-band", "In band"],
    ["below", "Below band"],
    ["above", "Above band on O₂"],
    ["overdue", "Overdue"],
    ["escalated", "Escalated"],
  ])("shows %s by a word and an icon, not colour alone", (status, word) => {
    const { container } = render(<StatusBadge status={status} />);
    expect(screen.getByText(word)).toBeTruthy();
    const icon = container.querySelector("svg");
    expect(icon).not.toBeNull();
    // The icon is decorative; the word carries the meaning for screen readers.
    expect(icon?.getAttribute("aria-hidden")).toBe("true");
  });

  it("lets a caller replace the word", () => {
    render(<StatusBadge status="neutral" label="No order yet" />);
    expect(screen.getByText("No order yet")).toBeTruthy();
  });
});
