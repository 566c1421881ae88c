import { useEffect, useState } from 'react';
import { Callout, FormGroup, HTMLSelect, HTMLTable, Tag } from '@blueprintjs/core';
import { useQuery } from '@tanstack/react-query';
import { PRESS_CONDITIONS, type PressConditionId } from '@psiform/contracts';
import type { PressSwatch } from '@psiform/colour';
import { describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { SampleFigure, mapColours, type Colours } from './CvdPreviews';

interface PressCheckDto {
  condition: (typeof PRESS_CONDITIONS)[number];
  swatches: (PressSwatch & { name: string })[];
}

/**
 * Each swatch through the press condition's real ICC profile (server: POST /api/press-conditions/:id/check, the
 * profiles in assets/icc): CMYK, total ink, ΔE00 of the sRGB → CMYK → CIELAB round trip, and the soft proof.
 */
export function PressCheck({ colours }: { colours: Colours }) {
  const api = useApi();
  const [condition, setCondition] = useState<PressConditionId>('fogra39');
  const [debounced, setDebounced] = useState(colours);
  useEffect(() => {
    const t = setTimeout(() => setDebounced(colours), 300);
    return () => clearTimeout(t);
  }, [colours]);
  const body = Object.fromEntries(Object.entries(debounced).filter(([, v]) => typeof v === 'string')) as Record<string, string>;
  const q = useQuery({
    queryKey: ['press-check', condition, body],
    queryFn: () => api.request<PressCheckDto>(`/api/press-conditions/${condition}/check`, { method: 'POST', body: { colours: body } }),
  });
  const proofOf = (hex: string) => q.data?.swatches.find((s) => s.hex === hex.toLowerCase())?.proofHex ?? hex;
  return (
    <section data-testid="press-check">
      <h3>On press</h3>
      <FormGroup label="Press condition" labelFor="sw-press" inline>
        <HTMLSelect id="sw-press" data-testid="sw-press" value={condition} onChange={(e) => setCondition(e.target.value as PressConditionId)}>
          {PRESS_CONDITIONS.map((c) => (
            <option key={c.id} value={c.id}>
              {c.name}
            </option>
          ))}
        </HTMLSelect>
      </FormGroup>
      {q.isError && <Callout intent="danger">{describeError(q.error)}</Callout>}
      {q.data && (
        <>
          <HTMLTable compact className="pf-table" data-testid="press-table">
            <thead>
              <tr>
                <th>Swatch</th>
                <th>C</th>
                <th>M</th>
                <th>Y</th>
                <th>K</th>
                <th>Total ink</th>
                <th>ΔE00 on paper</th>
                <th />
              </tr>
            </thead>
            <tbody>
              {q.data.swatches.map((s) => (
                <tr key={s.name} data-testid="press-row" data-name={s.name}>
                  <td>{s.name}</td>
                  {s.cmyk.map((v, i) => (
                    <td key={i}>{v.toFixed(1)}</td>
                  ))}
                  <td>{s.totalInk.toFixed(0)}%</td>
                  <td>{s.deltaE00.toFixed(1)}</td>
                  <td>
                    <Tag minimal intent={s.inGamut ? 'success' : 'warning'}>{s.inGamut ? 'in gamut' : 'out of gamut'}</Tag>
                  </td>
                </tr>
              ))}
            </tbody>
          </HTMLTable>
          <p className="pf-muted pf-small">
            Through the {q.data.condition.name} profile (relative colorimetric, total ink limit {q.data.condition.tacPercent}%). Soft proof: how the sample figure prints, shown on screen.
          </p>
          <SampleFigure kind="normal" colours={mapColours(colours, proofOf)} caption={`Soft proof, ${q.data.condition.name}`} testId="soft-proof-preview" />
        </>
      )}
    </section>
  );
}
