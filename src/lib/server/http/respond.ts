/**
 * Route helpers that turn a domain {@link Refusal} into what SvelteKit answers: the error page for
 * a 404 (or when there is no form), or the form's message with the refusal's status. Domain
 * modules return refusals and never import `@sveltejs/kit`; only routes call these.
 */
import { error, fail } from '@sveltejs/kit';
import { message, setError, type SuperValidated } from 'sveltekit-superforms';
import { isRefusal, type Refusal } from '../refusal';

/** The result, or the refusal thrown as an HTTP error. */
export function orError<T>(result: T | Refusal): T {
	if (isRefusal(result)) error(result.status, result.message);
	return result;
}

/**
 * A superforms answer to a refusal: a 404 is the not-found page (nothing to say about someone
 * else's row); anything else is the form's message, with field messages where the refusal names
 * fields, and the refusal's status.
 */
export function refusalMessage<T extends Record<string, unknown>>(
	form: SuperValidated<T>,
	refusal: Refusal
) {
	if (refusal.status === 404) error(404, refusal.message);
	for (const [field, text] of Object.entries(refusal.fields ?? {})) {
		if (field in form.data) setError(form, field as never, text);
	}
	return message(form, refusal.message, { status: refusal.status });
}

/** A plain form's answer to a refusal: 404 as the error page, else `fail` with `{ problem }`. */
export function refusalFail<T extends Record<string, unknown>>(refusal: Refusal, extra?: T) {
	if (refusal.status === 404) error(404, refusal.message);
	return fail(refusal.status, { ...extra, problem: refusal.message });
}
