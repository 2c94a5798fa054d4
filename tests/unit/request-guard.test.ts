import { describe, expect, it } from "vitest";
import { allowedOrigins, hasSessionCookie, refuseCrossSiteWrite } from "@/lib/request-guard";

const SELF = "https://tidemark.hospital.example";
const allowed = allowedOrigins(SELF, "https://portal.hospital.example");
const COOKIE = "next-auth.session-token=abc";

function request(method: string, pathname: string, headers: Record<string, string>) {
  return { method, pathname, headers: new Headers(headers), origin: SELF };
}

describe("cross-site writes with a session", () => {
  it("refuses a text/plain write from another site (the classic form post)", () => {
    const refusal = refuseCrossSiteWrite(
      request("POST", "/api/v1/readings", {
        cookie: COOKIE,
        origin: "https://evil.example",
        "content-type": "text/plain",
      }),
      allowed,
    );
    expect(refusal).toMatchObject({ status: 403 });
    expect(refusal?.message).toContain("https://evil.example");
  });

  it("refuses a cross-site write without Origin when Sec-Fetch-Site says so", () => {
    expect(
      refuseCrossSiteWrite(
        request("POST", "/api/v1/readings", {
          cookie: COOKIE,
          "sec-fetch-site": "cross-site",
          "content-type": "application/json",
        }),
        allowed,
      ),
    ).toMatchObject({ status: 403 });
  });

  it("refuses a same-site write that is not JSON (415), except the multipart upload", () => {
    const headers = { cookie: COOKIE, origin: SELF };
    expect(
      refuseCrossSiteWrite(
        request("POST", "/api/v1/readings", { ...headers, "content-type": "text/plain" }),
        allowed,
      ),
    ).toMatchObject({
      status: 415,
    });
    expect(
      refuseCrossSiteWrite(
        request("POST", "/api/v1/imports", {
          ...headers,
          "content-type": "multipart/form-data; boundary=x",
        }),
        allowed,
      ),
    ).toBeNull();
    expect(
      refuseCrossSiteWrite(
        request("POST", "/api/v1/readings", {
          ...headers,
          "content-type": "multipart/form-data; boundary=x",
        }),
        allowed,
      ),
    ).toMatchObject({ status: 415 });
  });

  it("lets through JSON from our own pages and listed origins, reads, token clients and non-browser clients", () => {
    const json = { "content-type": "application/json; charset=utf-8", cookie: COOKIE };
    expect(
      refuseCrossSiteWrite(request("POST", "/api/v1/readings", { ...json, origin: SELF }), allowed),
    ).toBeNull();
    expect(
      refuseCrossSiteWrite(
        request("PATCH", "/api/v1/users/3", { ...json, origin: "https://portal.hospital.example" }),
        allowed,
      ),
    ).toBeNull();
    expect(refuseCrossSiteWrite(request("POST", "/api/v1/readings", json), allowed)).toBeNull();
    expect(
      refuseCrossSiteWrite(
        request("GET", "/api/v1/board", { cookie: COOKIE, origin: "https://evil.example" }),
        allowed,
      ),
    ).toBeNull();
    expect(
      refuseCrossSiteWrite(
        request("POST", "/api/v1/imports/hl7", {
          authorization: "Bearer tdm_x",
          "content-type": "text/plain",
          origin: "https://evil.example",
        }),
        allowed,
      ),
    ).toBeNull();
  });

  it("recognises next-auth's session cookies, chunked and secure ones included", () => {
    expect(hasSessionCookie("a=1; next-auth.session-token.0=x")).toBe(true);
    expect(hasSessionCookie("__Secure-next-auth.session-token=x")).toBe(true);
    expect(hasSessionCookie("next-auth.csrf-token=x")).toBe(false);
    expect(hasSessionCookie(null)).toBe(false);
  });
});
