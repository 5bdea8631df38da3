import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from "react";
import { cx } from "./cx";

const control =
  "block w-full rounded-control border bg-white px-3 py-2 text-base text-ink-900 shadow-xs placeholder:text-ink-400 focus:outline-none focus:ring-2 focus:ring-brass-400 disabled:bg-ink-50";

function controlClasses(invalid: boolean) {
  return cx(control, invalid ? "border-beyond" : "border-ink-300");
}

type FieldFrameProps = {
  label: ReactNode;
  hint?: ReactNode;
  /** Messages for this field; the first is shown, all are announced. */
  errors?: readonly string[] | null;
  children: (ids: { id: string; describedBy: string | undefined; invalid: boolean }) => ReactNode;
  className?: string;
};

/** Label, control, hint and error wired together for screen readers. */
export function FieldFrame({ label, hint, errors, children, className }: FieldFrameProps) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = errors?.length ? `${id}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(" ") || undefined;
  return (
    <div className={cx("space-y-1.5", className)}>
      <label htmlFor={id} className="block text-sm font-semibold text-ink-800">
        {label}
      </label>
      {children({ id, describedBy, invalid: Boolean(errorId) })}
      {hint ? (
        <p id={hintId} className="text-sm text-ink-500">
          {hint}
        </p>
      ) : null}
      {errorId ? (
        <p id={errorId} className="text-sm font-medium text-beyond" role="alert">
          {errors!.join(" ")}
        </p>
      ) : null}
    </div>
  );
}

type Common = { label: ReactNode; hint?: ReactNode; errors?: readonly string[] | null; className?: string };

export function TextField({ label, hint, errors, className, ...input }: Common & InputHTMLAttributes<HTMLInputElement>) {
  return (
    <FieldFrame label={label} hint={hint} errors={errors} className={className}>
      {({ id, describedBy, invalid }) => (
        <input
          id={id}
          aria-describedby={describedBy}
          aria-invalid={invalid || undefined}
          className={controlClasses(invalid)}
          {...input}
        />
      )}
    </FieldFrame>
  );
}

export function TextAreaField({ label, hint, errors, className, ...input }: Common & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  return (
    <FieldFrame label={label} hint={hint} errors={errors} className={className}>
      {({ id, describedBy, invalid }) => (
        <textarea
          id={id}
          aria-describedby={describedBy}
          aria-invalid={invalid || undefined}
          className={cx(controlClasses(invalid), "min-h-28")}
          {...input}
        />
      )}
    </FieldFrame>
  );
}

/**
 * A native select: it works before JavaScript loads (forms here are progressively enhanced) and every
 * phone gives it its own accessible picker, which a custom listbox would have to imitate.
 */
export function SelectField({
  label,
  hint,
  errors,
  className,
  options,
  placeholder,
  ...select
}: Common &
  SelectHTMLAttributes<HTMLSelectElement> & {
    options: ReadonlyArray<{ value: string; label: string }>;
    placeholder?: string;
  }) {
  return (
    <FieldFrame label={label} hint={hint} errors={errors} className={className}>
      {({ id, describedBy, invalid }) => (
        <select
          id={id}
          aria-describedby={describedBy}
          aria-invalid={invalid || undefined}
          className={cx(controlClasses(invalid), "pr-8")}
          {...select}
        >
          {placeholder ? <option value="">{placeholder}</option> : null}
          {options.map((option) => (
            <option key={option.value} value={option.value}>
              {option.label}
            </option>
          ))}
        </select>
      )}
    </FieldFrame>
  );
}

export function CheckboxField({ label, hint, errors, className, ...input }: Common & InputHTMLAttributes<HTMLInputElement>) {
  const id = useId();
  return (
    <div className={cx("flex items-start gap-3", className)}>
      <input id={id} type="checkbox" className="mt-1 size-4 rounded border-ink-300 accent-ink-900" {...input} />
      <div>
        <label htmlFor={id} className="text-sm font-semibold text-ink-800">
          {label}
        </label>
        {hint ? <p className="text-sm text-ink-500">{hint}</p> : null}
        {errors?.length ? (
          <p className="text-sm font-medium text-beyond" role="alert">
            {errors.join(" ")}
          </p>
        ) : null}
      </div>
    </div>
  );
}
