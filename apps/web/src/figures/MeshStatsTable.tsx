import { HTMLTable } from '@blueprintjs/core';
import type { AssetDto, MeshStatsDto } from '@psiform/contracts';
import { formatNumber } from './model';
import { Typeset } from '../components/Typeset';
import { PSI_UNIT_TEXT } from '@psiform/print';

const PHASE_WORDS: Record<MeshStatsDto['phase'], string> = { '+': 'ψ > 0 (phase +)', '-': 'ψ < 0 (phase −)', complex: '|ψ| (complex phase)' };

/** Per-phase statistics of the mesh, read from the GLB asset's stats. */
export function MeshStatsTable({ asset }: { asset: AssetDto }) {
  const stats = asset.stats ?? null;
  const surfaces = stats?.surfaces ?? [];
  if (surfaces.length === 0) return <p className="pf-muted">This mesh carries no statistics.</p>;
  return (
    <div>
      <HTMLTable className="pf-table pf-num-table" compact data-testid="mesh-stats">
        <thead>
          <tr>
            <th scope="col">Phase</th>
            <th scope="col">Vertices</th>
            <th scope="col">Triangles</th>
            <th scope="col">Area (a0²)</th>
            <th scope="col">Volume (a0³)</th>
            <th scope="col">Components</th>
            <th scope="col">Euler characteristic</th>
            <th scope="col">Watertight</th>
          </tr>
        </thead>
        <tbody>
          {surfaces.map((s) => (
            <tr key={s.phase} data-testid="mesh-stats-row">
              <td>{PHASE_WORDS[s.phase] ?? s.phase}</td>
              <td>{formatNumber(s.vertices, 0)}</td>
              <td>{formatNumber(s.triangles, 0)}</td>
              <td>{formatNumber(s.area, 2)}</td>
              <td>{formatNumber(s.volume, 2)}</td>
              <td>{s.components}</td>
              <td>{s.euler}</td>
              <td>{s.watertight ? 'yes' : 'no'}</td>
            </tr>
          ))}
        </tbody>
      </HTMLTable>
      {(stats?.isovalue !== undefined || stats?.enclosed !== undefined) && (
        <p className="pf-muted pf-small" data-testid="mesh-level">
          {stats?.isovalue !== undefined && <>Isovalue |ψ| = {formatNumber(stats.isovalue, 6)} <Typeset text={PSI_UNIT_TEXT} />. </>}
          {stats?.enclosed !== undefined && <>Probability inside the surface on this grid: {formatNumber(stats.enclosed * 100, 2)}%.</>}
        </p>
      )}
    </div>
  );
}
