// Stands in for `$app/environment` in the drill's child process (plain tsx, no SvelteKit).
export const browser = false;
export const building = false;
export const dev = false;
export const version = 'drill';
