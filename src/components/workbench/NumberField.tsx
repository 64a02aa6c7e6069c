import type { JSX } from "react";

interface Props {
  id: string;
  label: string;
  value: string;
  onChange: (value: string) => void;
  /** Shown after the field: "mm", "cc", "°"… */
  unit?: string;
  error?: string;
  hint?: string;
  placeholder?: string;
  /** Allows a minus sign on phone keyboards. */
  signed?: boolean;
}

/** A typed measurement: text, so what was typed stays as typed, with its unit beside it. */
export default function NumberField({ id, label, value, onChange, unit, error, hint, placeholder, signed = false }: Props): JSX.Element {
  const described = [hint ? `${id}-hint` : "", error ? `${id}-error` : ""].filter(Boolean).join(" ") || undefined;
  return (
    // An empty optional field says nothing on paper.
    <div className={value.trim() === "" ? "print:hidden" : undefined}>
      <label className="rl-label" htmlFor={id}>
        {label}
      </label>
      <div className="flex items-stretch">
        <input
          id={id}
          name={id}
          className={`rl-field rl-num print:border-0 print:bg-transparent print:px-0 ${unit ? "rounded-r-none" : ""} ${error ? "border-oxide" : ""}`}
          type="text"
          inputMode={signed ? "text" : "decimal"}
          autoComplete="off"
          spellCheck={false}
          value={value}
          placeholder={placeholder}
          aria-invalid={error ? true : undefined}
          aria-describedby={described}
          onChange={(e) => onChange(e.target.value)}
        />
        {unit ? (
          <span className="flex min-w-[3rem] items-center justify-center whitespace-nowrap rounded-r-sm border-y-hair border-r-hair border-rule bg-paper px-2 text-sm font-semibold text-pencil print:border-0">
            {unit}
          </span>
        ) : null}
      </div>
      {hint ? (
        <p id={`${id}-hint`} className="mt-1 text-sm text-pencil">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} className="rl-error" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}
