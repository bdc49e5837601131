import { demoTourIfLoaded } from '$lib/server/demo-tour';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => ({ demoTour: await demoTourIfLoaded() });
