import type { RunListItem } from "@/lib/db/queries/run-views";

/**
 * The bench API's JSON for a run: snake_case with units in the names, like the CLI report.
 * Storage keys stay on the server; the raw file is reachable through its own route.
 */
export function runJson(r: RunListItem) {
  const analysed = r.latestVersion !== null;
  return {
    id: r.id,
    cell_serial: r.serial,
    status: r.status,
    purpose: r.purpose,
    source: r.source,
    ambient_temperature_C: r.ambientTempC,
    test_ended_at: r.testEndedAt?.toISOString() ?? null,
    operator_note: r.operatorNote,
    file: { name: r.fileName, size_bytes: r.fileSize, sha256: r.sha256 },
    uploaded_by: r.uploadedByName,
    created_at: r.createdAt.toISOString(),
    started_at: r.startedAt?.toISOString() ?? null,
    finished_at: r.finishedAt?.toISOString() ?? null,
    error: r.error,
    latest_version: r.latestVersion,
    key_numbers: analysed
      ? {
          charged_mAh: r.chargedMah,
          discharged_mAh: r.dischargedMah,
          coulombic_efficiency: r.coulombicEfficiency,
          switch_point: r.switchTimeS === null ? null : { time_s: r.switchTimeS, voltage_V: r.switchVoltageV, capacity_mAh: r.switchCapacityMah },
          findings: r.findingsCount,
          safety_findings: r.safetyFindingsCount,
        }
      : null,
    links: { self: `/api/v1/runs/${r.id}`, raw: `/api/runs/${r.id}/raw` },
  };
}

export type RunJson = ReturnType<typeof runJson>;
