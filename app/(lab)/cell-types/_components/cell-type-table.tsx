import { cellClass, SimpleTable, type SimpleHeader } from "@/components/ui/simple-table";
import type { CellTypeView } from "@/lib/db/queries/registry";
import { formatTemperatureWindow, formatTermination } from "@/lib/registry/format";

interface Column {
  header: string;
  unit?: string;
  cell: (t: CellTypeView) => string;
}

const columns: Column[] = [
  { header: "Chemistry", cell: (t) => t.chemistry },
  { header: "Rated", unit: "mAh", cell: (t) => String(t.ratedCapacityMah) },
  { header: "Nominal", unit: "V", cell: (t) => String(t.nominalVoltageV) },
  { header: "Charge limit", unit: "V", cell: (t) => String(t.chargeVoltageLimitV) },
  { header: "Cut-off", unit: "V", cell: (t) => String(t.dischargeCutoffV) },
  { header: "Charge rate, max", cell: (t) => `${t.maxChargeC}C` },
  { header: "Discharge rate, max", cell: (t) => `${t.maxDischargeC}C` },
  { header: "Charge ends at", cell: (t) => formatTermination(t.terminationC) },
  { header: "Charging", cell: (t) => formatTemperatureWindow(t.chargeTempMinC, t.chargeTempMaxC) },
  { header: "Discharging", cell: (t) => formatTemperatureWindow(t.dischargeTempMinC, t.dischargeTempMaxC) },
];

/** Every cell type with its limits; a lab has tens of them, so the server renders the whole list. */
export function CellTypeTable({ cellTypes, emptyHint }: { cellTypes: CellTypeView[]; emptyHint: string }) {
  const headers: SimpleHeader[] = [
    { key: "name", label: "Name" },
    ...columns.map((col) => ({
      key: col.header,
      right: true,
      label: (
        <>
          {col.header}
          {col.unit ? <span className="block font-normal normal-case">{col.unit}</span> : null}
        </>
      ),
    })),
  ];
  return (
    <SimpleTable caption="Cell types and their limits" headers={headers} boxed>
      {cellTypes.length === 0 ? (
        <tr>
          <td colSpan={headers.length} className="px-3 py-8 text-center text-ink-soft">
            {emptyHint}
          </td>
        </tr>
      ) : (
        cellTypes.map((t) => (
          <tr key={t.id} className="hover:bg-copper-wash/40">
            <th scope="row" className={`${cellClass()} text-left font-medium`}>
              {t.name}
              {t.notes ? <span className="block max-w-xs truncate text-xs font-normal text-ink-soft">{t.notes}</span> : null}
            </th>
            {columns.map((col) => (
              <td key={col.header} className={`${cellClass(true)} whitespace-nowrap`}>
                {col.cell(t)}
              </td>
            ))}
          </tr>
        ))
      )}
    </SimpleTable>
  );
}
