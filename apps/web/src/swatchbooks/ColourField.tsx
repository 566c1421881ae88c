import { useEffect, useState } from 'react';
import { FormGroup, InputGroup, Switch } from '@blueprintjs/core';
import { hexProblem } from '@psiform/contracts';
import { isHex } from '@psiform/colour';

/**
 * One swatch: the browser's colour picker and the hex text side by side. The text may be half-typed;
 * only a complete #rrggbb reaches onChange (lower-cased, the form swatchbooks store). Text that is not a
 * colour stays as typed with the message (the wording of libs/contracts, as the server answers) until it is
 * fixed: it never silently turns back into the old colour; onProblem tells the editor, which holds Save.
 */
export function ColourField({
  name,
  label,
  value,
  onChange,
  disabled,
  optional,
  onProblem,
}: {
  name: string;
  label: string;
  value: string | undefined;
  onChange(hex: string | undefined): void;
  disabled?: boolean;
  /** Optional swatches (nucleus, axes) can be left out. */
  optional?: boolean;
  /** Called with the field's message (or null) whenever it changes. */
  onProblem?(name: string, problem: string | null): void;
}) {
  const [text, setText] = useState(value ?? '');
  useEffect(() => setText(value ?? ''), [value]);
  const present = value !== undefined;
  const bad = present && text !== '' && !isHex(text) ? `“${text}”: ${hexProblem(text)}.` : text === '' && present ? 'A colour is required (# and six hex digits).' : null;
  useEffect(() => onProblem?.(name, bad), [name, bad, onProblem]);

  return (
    <FormGroup
      label={label}
      labelFor={`sw-${name}-hex`}
      intent={bad ? 'danger' : 'none'}
      helperText={bad ? <span data-testid={`sw-${name}-error`} role="alert">{bad}</span> : undefined}
      className="pf-colour-field"
    >
      <div className="pf-colour-row">
        {optional && (
          <Switch
            checked={present}
            disabled={disabled}
            onChange={(e) => onChange(e.currentTarget.checked ? (isHex(text) ? text.toLowerCase() : '#5f5a52') : undefined)}
            aria-label={`Use a ${label.toLowerCase()} colour`}
            data-testid={`sw-${name}-use`}
          />
        )}
        <input
          type="color"
          className="pf-colour-picker"
          value={isHex(value) ? value : '#000000'}
          disabled={disabled || !present}
          onChange={(e) => onChange(e.target.value.toLowerCase())}
          aria-label={`${label} colour picker`}
          data-testid={`sw-${name}-picker`}
        />
        <InputGroup
          id={`sw-${name}-hex`}
          value={text}
          disabled={disabled || !present}
          spellCheck={false}
          onChange={(e) => {
            const t = e.target.value.trim();
            setText(t);
            if (isHex(t)) onChange(t.toLowerCase());
          }}
          intent={bad ? 'danger' : 'none'}
          data-testid={`sw-${name}-hex`}
        />
      </div>
    </FormGroup>
  );
}
