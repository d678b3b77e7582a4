/** The header row of a compliance table: its leading columns, then one column per arm (with its revision when asked). */
export function ComplianceHead({ columns, arms, revisions = false }: { columns: string[]; arms: readonly { id: string; name: string; revision: number }[]; revisions?: boolean }) {
  return (
    <thead>
      <tr>
        {columns.map((c) => (
          <th scope="col" key={c}>
            {c}
          </th>
        ))}
        {arms.map((a) => (
          <th scope="col" key={a.id} data-arm-id={a.id}>
            {a.name}
            {revisions && (
              <>
                <br />
                <span className="hint">rev {a.revision}</span>
              </>
            )}
          </th>
        ))}
      </tr>
    </thead>
  );
}
