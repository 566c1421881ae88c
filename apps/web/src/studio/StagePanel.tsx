// Stage: camera, lights, material, background, annotations and the figure's canvas (physical size).
import { Button, ButtonGroup, FormGroup, HTMLSelect, InputGroup, Menu, MenuItem, PopoverNext, Slider, Switch, TextArea } from '@blueprintjs/core';
import type { Dispatch } from 'react';
import { CANVAS_LIMITS, TEXT_LIMITS, type Recipe } from '@psiform/contracts';
import { UNIT_TEXT } from '@psiform/print';
import { Typeset } from '../components/Typeset';
import { fieldText, type ComposerDraft, type DraftAction } from './draft';
import { SHORTCUTS } from './shortcuts';

type Stage = Recipe['stage'];
type Light = Stage['lights']['key'];

export interface StagePanelProps {
  draft: ComposerDraft;
  dispatch: Dispatch<DraftAction>;
  errors: Record<string, string>;
  /** The publication's one length unit: figures state their lengths in it (the server applies it on save). */
  publicationUnit?: Recipe['annotations']['scaleBar']['unit'];
}

const VIEW_BUTTONS: { view: Stage['camera']['view']; text: string; key: string }[] = [
  { view: 'axis_x', text: 'x', key: '1' },
  { view: 'axis_y', text: 'y', key: '2' },
  { view: 'axis_z', text: 'z', key: '3' },
  { view: 'three_quarter', text: '¾', key: '4' },
  { view: 'free', text: 'Free', key: '0' },
];

export function ShortcutHelp() {
  return (
    <PopoverNext
      placement="bottom-end"
      content={
        <Menu className="pf-shortcuts" data-testid="shortcut-help">
          {SHORTCUTS.map((s) => (
            <MenuItem key={s.key} text={s.what} label={s.key} disabled={false} shouldDismissPopover={false} />
          ))}
        </Menu>
      }
    >
      <Button minimal small icon="key-command" text="Shortcuts" data-testid="shortcut-help-button" />
    </PopoverNext>
  );
}

function LightRow({ name, light, onChange }: { name: string; light: Light; onChange(l: Light): void }) {
  return (
    <div className="pf-light" data-testid={`light-${name}`}>
      <div className="pf-light-head">
        <strong>{name}</strong>
        <input type="color" value={light.color} onChange={(e) => onChange({ ...light, color: e.currentTarget.value })} aria-label={`${name} light colour`} data-testid={`light-${name}-color`} />
      </div>
      <label className="pf-slider-label">Intensity {light.intensity.toFixed(1)}</label>
      <Slider min={0} max={6} stepSize={0.1} labelRenderer={false} value={light.intensity} onChange={(v) => onChange({ ...light, intensity: v })} />
      <label className="pf-slider-label">Azimuth {Math.round(light.azimuthDeg)}° (0 = from the viewer)</label>
      <Slider min={-180} max={180} stepSize={5} labelRenderer={false} value={light.azimuthDeg} onChange={(v) => onChange({ ...light, azimuthDeg: v })} />
      <label className="pf-slider-label">Elevation {Math.round(light.elevationDeg)}°</label>
      <Slider min={-90} max={90} stepSize={5} labelRenderer={false} value={light.elevationDeg} onChange={(v) => onChange({ ...light, elevationDeg: v })} />
    </div>
  );
}

/** A canvas length: typed text kept as typed, with the limit named under it while it is out of range. */
function MmField({ draft, dispatch, errors, k, label }: { draft: ComposerDraft; dispatch: Dispatch<DraftAction>; errors: Record<string, string>; k: 'widthMm' | 'heightMm'; label: string }) {
  const key = `canvas.${k}`;
  const id = k === 'widthMm' ? 'canvas-width' : 'canvas-height';
  const err = errors[key];
  return (
    <FormGroup
      label={label}
      labelFor={id}
      intent={err ? 'danger' : 'none'}
      helperText={
        err ? (
          <span data-testid={`${id}-error`} role="alert">
            {err}
          </span>
        ) : (
          `${CANVAS_LIMITS.mmMin}–${CANVAS_LIMITS.mmMax} mm`
        )
      }
    >
      <InputGroup
        id={id}
        value={fieldText(draft, key)}
        onValueChange={(v) => dispatch({ type: 'text', key, value: v })}
        intent={err ? 'danger' : 'none'}
        data-testid={id}
        rightElement={<span className="pf-ion">mm</span>}
      />
    </FormGroup>
  );
}

export function StagePanel({ draft, dispatch, errors, publicationUnit }: StagePanelProps) {
  const { stage, annotations: ann, canvas } = draft.recipe;
  const look = { stage, annotations: ann };
  const onLook = (l: typeof look) => dispatch({ type: 'look', stage: l.stage, annotations: l.annotations });
  const cam = stage.camera;
  const setStage = (s: Partial<Stage>) => onLook({ ...look, stage: { ...stage, ...s } });
  const setCam = (c: Partial<Stage['camera']>) => setStage({ camera: { ...cam, ...c } });
  const setAnn = (a: Partial<Recipe['annotations']>) => onLook({ ...look, annotations: { ...ann, ...a } });
  const setLight = (k: 'key' | 'fill' | 'rim', l: Light) => setStage({ lights: { ...stage.lights, [k]: l } });

  return (
    <div className="pf-stage" data-testid="stage-panel">
      <div className="pf-head-row">
        <h3>Camera</h3>
        <ShortcutHelp />
      </div>
      <ButtonGroup aria-label="Camera view" className="pf-gap-sm">
        {VIEW_BUTTONS.map((b) => (
          <Button
            key={b.view}
            text={b.text}
            title={`${b.view === 'free' ? 'Free orbit' : b.view === 'three_quarter' ? 'Three-quarter view' : `Along ${b.text}`} (key ${b.key})`}
            active={cam.view === b.view}
            aria-pressed={cam.view === b.view}
            onClick={() => setCam({ view: b.view })}
            data-testid={`view-${b.view}`}
          />
        ))}
      </ButtonGroup>
      <Switch
        label="Orthographic (no perspective)"
        checked={cam.projection === 'orthographic'}
        onChange={(e) => setCam({ projection: e.currentTarget.checked ? 'orthographic' : 'perspective' })}
        data-testid="stage-ortho"
      />
      <label className="pf-slider-label">Zoom {cam.zoom.toFixed(2)}×</label>
      <Slider min={0.5} max={3} stepSize={0.05} labelRenderer={false} value={cam.zoom} onChange={(v) => setCam({ zoom: v })} />
      {cam.projection === 'perspective' && (
        <>
          <label className="pf-slider-label">Field of view {Math.round(cam.fovDeg)}°</label>
          <Slider min={10} max={80} stepSize={1} labelRenderer={false} value={cam.fovDeg} onChange={(v) => setCam({ fovDeg: v })} />
        </>
      )}

      <h3>Lights</h3>
      <LightRow name="key" light={stage.lights.key} onChange={(l) => setLight('key', l)} />
      <LightRow name="fill" light={stage.lights.fill} onChange={(l) => setLight('fill', l)} />
      <LightRow name="rim" light={stage.lights.rim} onChange={(l) => setLight('rim', l)} />
      <label className="pf-slider-label">Ambient {stage.lights.ambient.toFixed(2)}</label>
      <Slider min={0} max={2} stepSize={0.05} labelRenderer={false} value={stage.lights.ambient} onChange={(v) => setStage({ lights: { ...stage.lights, ambient: v } })} />

      <h3>Material</h3>
      <label className="pf-slider-label">Gloss {stage.material.gloss.toFixed(2)}</label>
      <Slider min={0} max={1} stepSize={0.05} labelRenderer={false} value={stage.material.gloss} onChange={(v) => setStage({ material: { ...stage.material, gloss: v } })} />
      <label className="pf-slider-label">Opacity {stage.material.opacity.toFixed(2)}</label>
      <Slider min={0.1} max={1} stepSize={0.05} labelRenderer={false} value={stage.material.opacity} onChange={(v) => setStage({ material: { ...stage.material, opacity: v } })} />
      <Switch label="Outline nodal surfaces (ψ = 0)" checked={stage.material.nodalOutline} onChange={(e) => setStage({ material: { ...stage.material, nodalOutline: e.currentTarget.checked } })} data-testid="stage-outline" />

      <h3>Background</h3>
      <Switch label="Transparent" checked={stage.background.transparent} onChange={(e) => setStage({ background: { ...stage.background, transparent: e.currentTarget.checked } })} data-testid="stage-transparent" />
      {!stage.background.transparent && (
        <input type="color" value={stage.background.color} onChange={(e) => setStage({ background: { ...stage.background, color: e.currentTarget.value } })} aria-label="Background colour" data-testid="stage-bg-color" />
      )}

      <h3>Annotations</h3>
      <Switch label="Axes (x, y, z)" checked={ann.axes} onChange={(e) => setAnn({ axes: e.currentTarget.checked })} data-testid="ann-axes" />
      <Switch label="Nucleus marker" checked={ann.nucleus} onChange={(e) => setAnn({ nucleus: e.currentTarget.checked })} data-testid="ann-nucleus" />
      <Switch label="Orbital label" checked={ann.label.show} onChange={(e) => setAnn({ label: { ...ann.label, show: e.currentTarget.checked } })} data-testid="ann-label" />
      {ann.label.show && (
        <FormGroup
          intent={errors['label.text'] ? 'danger' : 'none'}
          helperText={errors['label.text'] ? <span data-testid="ann-label-text-error" role="alert">{errors['label.text']}</span> : `Up to ${TEXT_LIMITS.labelMax} characters; write 3d_z² for a subscript.`}
        >
          <InputGroup placeholder="Label text (default: from the state)" value={fieldText(draft, 'label.text')} onValueChange={(v) => dispatch({ type: 'text', key: 'label.text', value: v })} data-testid="ann-label-text" />
        </FormGroup>
      )}
      <Switch label="Scale bar" checked={ann.scaleBar.show} onChange={(e) => setAnn({ scaleBar: { ...ann.scaleBar, show: e.currentTarget.checked } })} data-testid="ann-scalebar" />
      {ann.scaleBar.show && (
        <div className="pf-form-row">
          <span className="pf-muted pf-small" data-testid="ann-scalebar-unit" data-unit={ann.scaleBar.unit} title="Set per publication on its House style page">
            in <Typeset text={UNIT_TEXT[ann.scaleBar.unit]} />
            {publicationUnit && publicationUnit !== ann.scaleBar.unit ? (
              <>
                {' '}
                (the publication now uses <Typeset text={UNIT_TEXT[publicationUnit]} />: the next saved version will)
              </>
            ) : (
              ' (the publication’s unit)'
            )}
          </span>
          <InputGroup
            placeholder="length: auto"
            defaultValue={ann.scaleBar.length ? String(ann.scaleBar.length) : ''}
            key={String(ann.scaleBar.length)}
            onBlur={(e) => {
              const x = Number(e.currentTarget.value);
              setAnn({ scaleBar: { ...ann.scaleBar, length: e.currentTarget.value.trim() && x > 0 ? x : undefined } });
            }}
            aria-label="Scale bar length (empty: a round length chosen for the view)"
            data-testid="ann-scalebar-length"
          />
        </div>
      )}
      <FormGroup
        label="Caption (drawn in the figure)"
        labelFor="ann-caption"
        intent={errors.caption ? 'danger' : 'none'}
        helperText={errors.caption ? <span data-testid="ann-caption-error" role="alert">{errors.caption}</span> : `Up to ${TEXT_LIMITS.captionMax} characters.`}
      >
        <TextArea id="ann-caption" fill value={fieldText(draft, 'caption')} onChange={(e) => dispatch({ type: 'text', key: 'caption', value: e.currentTarget.value })} data-testid="ann-caption" />
      </FormGroup>

      <h3>Canvas</h3>
      <div className="pf-form-row">
        <MmField draft={draft} dispatch={dispatch} errors={errors} k="widthMm" label="Width" />
        <MmField draft={draft} dispatch={dispatch} errors={errors} k="heightMm" label="Height" />
        <FormGroup label="dpi" labelFor="canvas-dpi">
          <HTMLSelect
            id="canvas-dpi"
            value={String(canvas.dpi)}
            onChange={(e) => dispatch({ type: 'canvas', canvas: { dpi: Number(e.currentTarget.value) as 300 | 600 | 1200 } })}
            options={['300', '600', '1200']}
            data-testid="canvas-dpi"
          />
        </FormGroup>
      </div>
    </div>
  );
}
