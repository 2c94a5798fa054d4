import { describe, expect, it } from "vitest";
import { can, mayAdjustDevice, PERMISSIONS, type Permission } from "@/lib/auth/permissions";
import { ROLES, type Role } from "@/lib/auth/roles";
import { DEVICE_PROFILES } from "@/lib/devices";

// The roles table of DEVELOPERS.md, written out independently of the code.
const TABLE: Record<Permission, Role[]> = {
  "order.write": ["physician", "therapist", "nurse"],
  "order.sign": ["physician"],
  "order.cosign": ["physician"],
  "order.discontinue": ["physician"],
  "order_request.send": ["therapist", "nurse"],
  "order_request.answer": ["physician"],
  "order.acknowledge_change": ["physician", "therapist", "nurse"],
  "adjustment.record": ["physician", "therapist", "nurse"],
  "reading.chart": ["physician", "therapist", "nurse"],
  "blood_gas.record": ["physician", "therapist", "nurse"],
  "ventilator_check.record": ["physician", "therapist"],
  "alert.act": ["physician", "therapist", "nurse"],
  "import.upload": ["therapist", "admin"],
  "admission.manage": ["physician", "nurse", "admin"],
  "unit.manage": ["admin"],
  "assignment.manage": ["nurse", "admin"],
  "handoff.acknowledge": ["nurse"],
  "user.manage": ["admin"],
  "api_token.manage": ["admin"],
  "step_table.manage": ["admin"],
  "rehearsal.run": ["physician", "admin"],
  "record.read": ["physician", "therapist", "nurse", "reviewer", "admin"],
  "ledger.oversee": ["reviewer", "admin"],
  "account.self": ["physician", "therapist", "nurse", "reviewer", "admin"],
  "account.password": ["physician", "therapist", "nurse", "reviewer", "admin"],
};

describe("the permission table", () => {
  it("grants exactly the roles table, cell by cell", () => {
    expect(Object.keys(PERMISSIONS).sort()).toEqual(Object.keys(TABLE).sort());
    for (const permission of Object.keys(TABLE) as Permission[]) {
      for (const role of ROLES) {
        expect(can({ role }, permission), `${role} ${permission}`).toBe(
          TABLE[permission].includes(role),
        );
      }
    }
  });

  it("lets nurses record changes on low-flow devices only", () => {
    expect(mayAdjustDevice({ role: "nurse" }, DEVICE_PROFILES.nasal_cannula)).toBe(true);
    expect(mayAdjustDevice({ role: "nurse" }, DEVICE_PROFILES.hfnc)).toBe(false);
    expect(mayAdjustDevice({ role: "therapist" }, DEVICE_PROFILES.hfnc)).toBe(true);
    expect(mayAdjustDevice({ role: "reviewer" }, DEVICE_PROFILES.nasal_cannula)).toBe(false);
  });
});
