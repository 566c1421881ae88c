/** A table's column headings (an empty string: a column without a heading, e.g. for buttons or thumbnails). */
export function TableHead({ columns }: { columns: readonly string[] }) {
  return (
    <thead>
      <tr>
        {columns.map((c, i) => (c ? <th key={i} scope="col">{c}</th> : <th key={i} scope="col" />))}
      </tr>
    </thead>
  );
}
