import { useEffect, useState } from 'react';
import { FormGroup, InputGroup, Switch } from '@blueprintjs/core';
import { isHex } from '@psiform/colour';

/**
 * One swatch: the browser's colour picker and the hex text side by side. The text may be half-typed;
 * only a complete #rrggbb reaches onChange (lower-cased, the form swatchbooks store).
 */
export function ColourField({
  name,
  label,
  value,
  onChange,
  disabled,
  optional,
}: {
  name: string;
  label: string;
  value: string | undefined;
  onChange(hex: string | undefined): void;
  disabled?: boolean;
  /** Optional swatches (nucleus, axes) can be left out. */
  optional?: boolean;
}) {
  const [text, setText] = useState(value ?? '');
  useEffect(() => setText(value ?? ''), [value]);
  const present = value !== undefined;
  const bad = present && text !== '' && !isHex(text) ? 'Use the form #rrggbb, e.g. #2f6690.' : text === '' && present ? 'A colour is required.' : null;

  return (
    <FormGroup label={label} labelFor={`sw-${name}-hex`} intent={bad ? 'danger' : 'none'} helperText={bad ?? undefined} className="pf-colour-field">
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
          maxLength={7}
          spellCheck={false}
          onChange={(e) => {
            const t = e.target.value.trim();
            setText(t);
            if (isHex(t)) onChange(t.toLowerCase());
          }}
          onBlur={() => setText(value ?? '')}
          intent={bad ? 'danger' : 'none'}
          data-testid={`sw-${name}-hex`}
        />
      </div>
    </FormGroup>
  );
}
