// Stage keyboard shortcuts (our own choice of keys): views, projection, axes, label.
import type { Recipe } from '@psiform/contracts';

export interface Look {
  stage: Recipe['stage'];
  annotations: Recipe['annotations'];
}

export const SHORTCUTS: { key: string; what: string }[] = [
  { key: '1', what: 'View along x' },
  { key: '2', what: 'View along y' },
  { key: '3', what: 'View along z (from above)' },
  { key: '4', what: 'Three-quarter view' },
  { key: '0', what: 'Free orbit (drag to turn)' },
  { key: 'O', what: 'Orthographic / perspective' },
  { key: 'A', what: 'Axes on / off' },
  { key: 'L', what: 'Orbital label on / off' },
  { key: '?', what: 'Show these shortcuts' },
];

const VIEWS: Record<string, Recipe['stage']['camera']['view']> = { '1': 'axis_x', '2': 'axis_y', '3': 'axis_z', '4': 'three_quarter', '0': 'free' };

/** The look after a key press, or null when the key is not a shortcut. */
export function applyShortcut(look: Look, key: string): Look | null {
  const k = key.length === 1 ? key.toLowerCase() : key;
  const view = VIEWS[k];
  if (view) return { ...look, stage: { ...look.stage, camera: { ...look.stage.camera, view } } };
  if (k === 'o') {
    const projection = look.stage.camera.projection === 'orthographic' ? 'perspective' : 'orthographic';
    return { ...look, stage: { ...look.stage, camera: { ...look.stage.camera, projection } } };
  }
  if (k === 'a') return { ...look, annotations: { ...look.annotations, axes: !look.annotations.axes } };
  if (k === 'l') return { ...look, annotations: { ...look.annotations, label: { ...look.annotations.label, show: !look.annotations.label.show } } };
  return null;
}

/** Typing in a field must not move the camera. */
export function isTypingTarget(t: EventTarget | null): boolean {
  const el = t as HTMLElement | null;
  if (!el || !el.tagName) return false;
  const tag = el.tagName.toLowerCase();
  return tag === 'input' || tag === 'textarea' || tag === 'select' || el.isContentEditable;
}
