// A publication's one length unit (Å or a0) for every figure: scale bars, section-map axes, radial plots.
// Art directors and admins choose it; every figure version saved from then on states its lengths in it.
import { useState } from 'react';
import { Button, FormGroup, HTMLSelect } from '@blueprintjs/core';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { LENGTH_UNITS, type LengthUnit, type PublicationDto } from '@psiform/contracts';
import { useApi, useAuth } from '../auth/AuthProvider';
import { Typeset } from '../components/Typeset';
import { CallFailed } from '../components/CallFailed';

export const UNIT_WORDS: Record<LengthUnit, string> = { angstrom: 'ångström (Å)', bohr: 'Bohr radius (a0)' };

export function LengthUnitPanel({ publication }: { publication: PublicationDto }) {
  const api = useApi();
  const { user } = useAuth();
  const queryClient = useQueryClient();
  const canEdit = user?.role === 'art_director' || user?.role === 'admin';
  const [unit, setUnit] = useState<LengthUnit>(publication.lengthUnit);
  const save = useMutation({
    mutationFn: () => api.request<PublicationDto>(`/api/publications/${encodeURIComponent(publication.id)}/length-unit`, { method: 'PUT', body: { lengthUnit: unit } }),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: ['publications'] }),
  });
  return (
    <div className="pf-gap" data-testid="length-unit-panel">
      <h2>Length unit</h2>
      <p className="pf-muted">
        Every figure of this publication states its lengths in one unit: the scale bar, the axes of section maps and the radius of radial plots. Now:{' '}
        <strong data-testid="length-unit-current">
          <Typeset text={publication.lengthUnit === 'angstrom' ? 'Å' : 'a0'} />
        </strong>
        . A change applies to each figure version saved from then on.
      </p>
      {canEdit && (
        <div className="pf-form-row">
          <FormGroup label="Unit" labelFor="length-unit">
            <HTMLSelect id="length-unit" value={unit} onChange={(e) => setUnit(e.currentTarget.value as LengthUnit)} options={LENGTH_UNITS.map((u) => ({ value: u, label: UNIT_WORDS[u] }))} data-testid="length-unit" />
          </FormGroup>
          <FormGroup label=" ">
            <Button intent="primary" text="Use this unit" disabled={unit === publication.lengthUnit} loading={save.isPending} onClick={() => save.mutate()} data-testid="length-unit-save" />
          </FormGroup>
        </div>
      )}
      <CallFailed call={save} testId="length-unit-error" />
    </div>
  );
}
