import { FormGroup, HTMLSelect } from '@blueprintjs/core';
import type { PublicationDto } from '@psiform/contracts';

/** A select of the user's publications; shown only when there is a choice to make. */
export function PublicationChooser({
  publications,
  value,
  onChange,
  id = 'publication-chooser',
  inline = false,
}: {
  publications: PublicationDto[];
  value: string;
  onChange(id: string): void;
  id?: string;
  inline?: boolean;
}) {
  if (publications.length < 2) return null;
  return (
    <FormGroup label="Publication" labelFor={id} inline={inline} className="pf-chooser">
      <HTMLSelect
        id={id}
        value={value}
        onChange={(e) => onChange(e.currentTarget.value)}
        data-testid="publication-chooser"
        options={publications.map((p) => ({ value: p.id, label: p.title }))}
      />
    </FormGroup>
  );
}
