import type { JSX } from "react";

interface Option<T extends string> {
  value: T;
  label: string;
}

interface Props<T extends string> {
  name: string;
  legend: string;
  value: T;
  options: readonly Option<T>[];
  onChange: (value: T) => void;
  /** Hide the legend visually (it stays for screen readers). */
  quietLegend?: boolean;
}

/** A row of radio buttons drawn as a segmented switch; the chosen one is filled, not only coloured. */
export default function Choice<T extends string>({ name, legend, value, options, onChange, quietLegend = false }: Props<T>): JSX.Element {
  return (
    <fieldset className="min-w-0">
      <legend className={quietLegend ? "sr-only" : "rl-label"}>{legend}</legend>
      <div className="inline-flex flex-wrap overflow-hidden rounded-sm border-hair border-rule">
        {options.map((o) => {
          const id = `${name}-${o.value}`;
          const checked = o.value === value;
          return (
            <label
              key={o.value}
              htmlFor={id}
              className={`cursor-pointer border-r-hair border-rule px-3 py-2 text-sm font-semibold last:border-r-0 has-[:focus-visible]:outline has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-focus ${
                checked ? "bg-ink text-paper" : "bg-sheet text-ink hover:bg-paper print:hidden"
              }`}
            >
              <input
                id={id}
                className="sr-only"
                type="radio"
                name={name}
                value={o.value}
                checked={checked}
                onChange={() => onChange(o.value)}
              />
              {o.label}
            </label>
          );
        })}
      </div>
    </fieldset>
  );
}
