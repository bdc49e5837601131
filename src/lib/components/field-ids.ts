/**
 * How the form pieces in this folder name their elements, so a label, its hint and its error line
 * point at each other the same way in every field.
 */

/** The id of a field's control; its hint is `${id}-hint`, its error line `${id}-error`. */
export const fieldId = (field: string) => `field-${field.replace(/[^a-z0-9]/gi, '-')}`;

/** `aria-describedby` for a control: its hint and its error line, when they are shown. */
export function describedBy(id: string, hint: boolean, invalid: boolean): string | undefined {
	return [hint && `${id}-hint`, invalid && `${id}-error`].filter(Boolean).join(' ') || undefined;
}

/** One choice in a select. */
export type SelectOption = { value: string; label: string };

/** A select's choices: a list, or a map of stored value to the words people see. */
export type SelectOptions = readonly SelectOption[] | Readonly<Record<string, string>>;

/** The choices as a list, in the map's order. */
export const optionList = (options: SelectOptions): readonly SelectOption[] =>
	Array.isArray(options)
		? options
		: Object.entries(options).map(([value, label]) => ({ value, label }));
