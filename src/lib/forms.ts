import type { SubmitFunction } from '@sveltejs/kit';

/**
 * A `use:enhance` submit function that reports when the form is busy, so its button can say so.
 * `keep` leaves the typed values in place after the answer (sign-in and sign-up keep the email).
 */
export function busySubmit(setBusy: (busy: boolean) => void, keep = false): SubmitFunction {
	return () => {
		setBusy(true);
		return async ({ update }) => {
			await update({ reset: !keep });
			setBusy(false);
		};
	};
}
