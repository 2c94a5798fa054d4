"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useId, useMemo, useState } from "react";
import { useForm, type Resolver } from "react-hook-form";
import type { z } from "zod";
import {
  FormStatus,
  fromZonedLocalInput,
  localDateTimeSchema,
  NumberField,
  refusalNotice,
  toZonedLocalInput,
  UnitTimeField,
  useHydrated,
  useIdempotencyKey,
  type FormNotice,
} from "@/components/bedside/BedsideFormParts";
import { Button, buttonClasses } from "@/components/ui/Button";
import { breachWords } from "@/lib/ventilation/evaluate";
import {
  tidalVolumeForTarget,
  VENT_MODE_LABELS,
  type VentilatorOrderSettings,
} from "@/lib/ventilation/settings";
import { recordVentilatorCheckAction } from "@/lib/ventilator-checks/actions";
import { checkPressures, ventilatorCheckFields } from "@/lib/ventilator-checks/schema";

/** The form's schema: the shared fields and pressure rule, the time on the unit's clock. */
const formSchema = ventilatorCheckFields
  .omit({ patientId: true, checkedAt: true, idempotencyKey: true })
  .extend({ checkedAt: localDateTimeSchema("Time checked") })
  .superRefine(checkPressures, { when: () => true });
type FormInput = z.input<typeof formSchema>;
type FormOutput = z.output<typeof formSchema>;
const FIELDS = [
  "checkedAt",
  "setVt",
  "measuredVt",
  "setRate",
  "measuredRate",
  "minuteVentilation",
  "peak",
  "plateau",
  "totalPeep",
] as const;

/**
 * Record a ventilator check: set and measured tidal volume and rate, minute
 * ventilation, peak, plateau and total PEEP. Tidemark computes the rest and
 * holds it against the order's lung-protective limits.
 */
export function VentilatorCheckForm({
  patientId,
  timeZone,
  ventilator,
}: {
  patientId: number;
  timeZone: string;
  ventilator: VentilatorOrderSettings;
}) {
  const id = useId();
  const router = useRouter();
  const hydrated = useHydrated();
  const idempotencyKey = useIdempotencyKey();
  const [notice, setNotice] = useState<FormNotice | null>(null);
  const [saved, setSaved] = useState(false);
  const resolver = useMemo<Resolver<FormInput, unknown, FormOutput>>(
    () => zodResolver(formSchema),
    [],
  );
  const form = useForm<FormInput, unknown, FormOutput>({
    resolver,
    defaultValues: { checkedAt: toZonedLocalInput(new Date(), timeZone) },
  });
  const onSubmit = form.handleSubmit(async (values) => {
    setNotice(null);
    const checkedAt = fromZonedLocalInput(values.checkedAt, timeZone);
    if (!checkedAt) {
      form.setError("checkedAt", {
        type: "client",
        message: "Time checked must be a date and time.",
      });
      return;
    }
    let result: Awaited<ReturnType<typeof recordVentilatorCheckAction>>;
    try {
      result = await recordVentilatorCheckAction({
        ...values,
        patientId,
        checkedAt: checkedAt.toISOString(),
        idempotencyKey,
      });
    } catch {
      setNotice({
        kind: "error",
        text: "Tidemark could not be reached; nothing was recorded. Try again — your values are kept.",
      });
      return;
    }
    if (!result.ok) {
      setNotice(
        refusalNotice(result, FIELDS, form.setError, {
          sessionEnded:
            "Your session has ended. Sign in again in another tab, then record the check; your values are kept here.",
        }),
      );
      return;
    }
    setSaved(true);
    const { breaches } = result.data;
    setNotice({
      kind: breaches.length ? "error" : "success",
      text: breaches.length
        ? `Check recorded, beyond the order's lung-protective limits: ${breaches.map(breachWords).join("; ")}. The therapist and physician are alerted. Opening the Chart…`
        : `Check recorded: VT ${result.data.indices.vtPerKg.value.toFixed(1)} mL/kg PBW, within the order's limits. Opening the Chart…`,
    });
    router.push(`/patients/${patientId}`);
  });
  const v = ventilator;
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="Ventilator check"
      data-ready={hydrated ? "true" : undefined}
      className="rounded-card border border-border bg-surface p-4 shadow-card"
    >
      <fieldset disabled={!hydrated} className="min-w-0 space-y-4">
        <p className="text-sm text-ink-muted" data-testid="check-order">
          Order in effect: {VENT_MODE_LABELS[v.mode]}, VT {v.vtTargetMlKg} mL/kg PBW ={" "}
          {tidalVolumeForTarget(v.vtTargetMlKg, v.pbwKg)} mL (up to {v.vtMaxMlKg} mL/kg ={" "}
          {tidalVolumeForTarget(v.vtMaxMlKg, v.pbwKg)} mL), plateau ≤ {v.plateauLimit}, driving
          pressure ≤ {v.drivingLimit} cmH2O.
        </p>
        <fieldset className="grid grid-cols-2 gap-x-3 sm:grid-cols-4">
          <legend className="mb-1 text-sm font-semibold">Volumes and rate</legend>
          <NumberField
            form={form}
            id={id}
            name="setVt"
            label="Set VT (mL)"
            hint="Optional"
            inputMode="numeric"
          />
          <NumberField
            form={form}
            id={id}
            name="measuredVt"
            label="Measured VT (mL)"
            hint="Exhaled"
            inputMode="numeric"
          />
          <NumberField
            form={form}
            id={id}
            name="setRate"
            label="Set rate (/min)"
            hint="Optional"
            inputMode="numeric"
          />
          <NumberField
            form={form}
            id={id}
            name="measuredRate"
            label="Measured rate (/min)"
            inputMode="numeric"
          />
          <NumberField
            form={form}
            id={id}
            name="minuteVentilation"
            label="Minute ventilation (L/min)"
            hint="Optional"
          />
        </fieldset>
        <fieldset className="grid grid-cols-2 gap-x-3 sm:grid-cols-4">
          <legend className="mb-1 text-sm font-semibold">Pressures (cmH2O)</legend>
          <NumberField form={form} id={id} name="peak" label="Peak" hint="Optional" />
          <NumberField form={form} id={id} name="plateau" label="Plateau" hint="Inspiratory hold" />
          <NumberField
            form={form}
            id={id}
            name="totalPeep"
            label="Total PEEP"
            hint="Expiratory hold"
          />
          <UnitTimeField
            form={form}
            id={id}
            name="checkedAt"
            label="Time checked"
            timeZone={timeZone}
          />
        </fieldset>
        <p className="text-xs text-ink-muted">
          PaCO2 comes from the latest arterial gas of the last 6 hours, when there is one.
        </p>
        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={form.formState.isSubmitting || saved}>
            {form.formState.isSubmitting ? "Recording…" : saved ? "Recorded" : "Record check"}
          </Button>
          <Link href={`/patients/${patientId}`} className={buttonClasses("ghost")}>
            Cancel
          </Link>
        </div>
        <FormStatus notice={notice} />
      </fieldset>
    </form>
  );
}
