import { fireEvent, render, screen, waitFor } from "@testing-library/react";
import type { AnchorHTMLAttributes } from "react";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { ChangePasswordForm } from "@/components/accounts/ChangePasswordForm";
import { ForgotPasswordForm } from "@/components/accounts/ForgotPasswordForm";
import { SetPasswordForm } from "@/components/accounts/SetPasswordForm";
import type { ActionResult } from "@/lib/action-result";

const changePasswordAction = vi.fn<(input: unknown) => Promise<ActionResult<{ changed: true }>>>();
const push = vi.fn();
const replace = vi.fn();
const refresh = vi.fn();
vi.mock("@/lib/accounts/actions", () => ({
  changePasswordAction: (input: unknown) => changePasswordAction(input),
}));
vi.mock("next/navigation", () => ({ useRouter: () => ({ push, replace, refresh }) }));
vi.mock("next/link", () => ({
  default: ({ href, ...rest }: AnchorHTMLAttributes<HTMLAnchorElement> & { href: string }) => (
    <a href={href} {...rest} />
  ),
}));

const fetchMock = vi.fn<typeof fetch>();
beforeEach(() => {
  vi.stubGlobal("fetch", fetchMock);
  fetchMock.mockReset();
  changePasswordAction.mockReset();
  push.mockReset();
  replace.mockReset();
});
afterEach(() => vi.unstubAllGlobals());

const json = (status: number, body: unknown) =>
  new Response(JSON.stringify(body), { status, headers: { "content-type": "application/json" } });

describe("forgot password", () => {
  it("names the field before sending, then shows the server's one answer", async () => {
    render(<ForgotPasswordForm />);
    fireEvent.click(screen.getByRole("button", { name: "E-mail me a link" }));
    expect(await screen.findByText("Enter your e-mail address.")).toBeTruthy();
    expect(fetchMock).not.toHaveBeenCalled();

    fetchMock.mockResolvedValueOnce(
      json(202, { message: "If an active account uses that address…" }),
    );
    fireEvent.change(screen.getByLabelText("E-mail"), { target: { value: "Ada@Kestrel.example" } });
    fireEvent.click(screen.getByRole("button", { name: "E-mail me a link" }));
    expect((await screen.findByTestId("reset-answer")).textContent).toBe(
      "If an active account uses that address…",
    );
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(url).toBe("/api/auth/reset");
    expect(JSON.parse(init?.body as string)).toEqual({ email: "ada@kestrel.example" });
  });

  it("shows a quota refusal in words", async () => {
    fetchMock.mockResolvedValueOnce(
      json(429, { error: { message: "Too many password-reset requests for this address." } }),
    );
    render(<ForgotPasswordForm />);
    fireEvent.change(screen.getByLabelText("E-mail"), { target: { value: "ada@kestrel.example" } });
    fireEvent.click(screen.getByRole("button", { name: "E-mail me a link" }));
    expect(await screen.findByText(/Too many password-reset requests/)).toBeTruthy();
  });
});

describe("set password from a link", () => {
  it("refuses two different passwords beside the second field, and a used link in words", async () => {
    render(<SetPasswordForm token={"t".repeat(43)} email="ada@kestrel.example" />);
    fireEvent.change(screen.getByLabelText("New password"), {
      target: { value: "a-long-password-1" },
    });
    fireEvent.change(screen.getByLabelText("New password, again"), {
      target: { value: "a-long-password-2" },
    });
    fireEvent.click(screen.getByRole("button", { name: "Set password" }));
    expect(await screen.findByText(/The two passwords differ/)).toBeTruthy();
    expect(screen.getByLabelText("New password, again").getAttribute("aria-invalid")).toBe("true");

    fetchMock.mockResolvedValueOnce(
      json(400, {
        error: {
          message: "This link was already used.",
          fieldErrors: { token: ["This link was already used."] },
        },
      }),
    );
    fireEvent.change(screen.getByLabelText("New password, again"), {
      target: { value: "a-long-password-1" },
    });
    fireEvent.click(screen.getByRole("button", { name: "Set password" }));
    expect((await screen.findByText("This link was already used.")).getAttribute("role")).toBe(
      "alert",
    );
    expect(push).not.toHaveBeenCalled();
  });

  it("goes to sign-in with the address once the password is set", async () => {
    fetchMock.mockResolvedValueOnce(json(200, { email: "ada@kestrel.example" }));
    render(<SetPasswordForm token={"t".repeat(43)} email="ada@kestrel.example" />);
    for (const label of ["New password", "New password, again"])
      fireEvent.change(screen.getByLabelText(label), { target: { value: "a-long-password-1" } });
    fireEvent.click(screen.getByRole("button", { name: "Set password" }));
    await waitFor(() =>
      expect(push).toHaveBeenCalledWith("/sign-in?password=set&email=ada%40kestrel.example"),
    );
  });
});

describe("change own password", () => {
  it("puts the server's refusal beside the field it names, and goes on once changed", async () => {
    changePasswordAction.mockResolvedValueOnce({
      ok: false,
      status: 400,
      message: "Choose a new password.",
      fieldErrors: {
        password: ["Choose a password different from the one your administrator set."],
      },
    });
    render(<ChangePasswordForm next="/" />);
    fireEvent.change(screen.getByLabelText("Current password"), {
      target: { value: "set-by-admin-1" },
    });
    for (const label of ["New password", "New password, again"])
      fireEvent.change(screen.getByLabelText(label), { target: { value: "set-by-admin-1" } });
    fireEvent.click(screen.getByRole("button", { name: "Change password" }));
    expect(
      await screen.findByText("Choose a password different from the one your administrator set."),
    ).toBeTruthy();
    expect(replace).not.toHaveBeenCalled();

    changePasswordAction.mockResolvedValueOnce({ ok: true, data: { changed: true } });
    for (const label of ["New password", "New password, again"])
      fireEvent.change(screen.getByLabelText(label), { target: { value: "my-own-choice-1" } });
    fireEvent.click(screen.getByRole("button", { name: "Change password" }));
    await waitFor(() => expect(replace).toHaveBeenCalledWith("/"));
  });
});
