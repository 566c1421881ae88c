/**
 * A table's column headings. An empty string: a column without a heading (e.g. thumbnails); `{ hidden: 'Actions' }`:
 * a heading only screen readers read (a column of buttons).
 */
export function TableHead({ columns }: { columns: readonly (string | { hidden: string })[] }) {
  return (
    <thead>
      <tr>
        {columns.map((c, i) =>
          typeof c !== 'string' ? (
            <th key={i} scope="col">
              <span className="pf-visually-hidden">{c.hidden}</span>
            </th>
          ) : c ? (
            <th key={i} scope="col">
              {c}
            </th>
          ) : (
            <th key={i} scope="col" />
          ),
        )}
      </tr>
    </thead>
  );
}
