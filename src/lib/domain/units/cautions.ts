/**
 * The caution each kind of station shows. Plain words of common practice; every caution box
 * also says to follow the maker's data and the shop's procedures.
 */
import type { Stage } from './states';

export const STATION_CAUTIONS: Partial<Record<Stage, string>> = {
	teardown: 'Cores can hold oil and sharp edges; wheels may be cracked. Gloves and eye protection on.',
	clean: 'Shot blast and hot wash: wear eye, ear and breathing protection; keep the cabinet closed while blasting; hot parts and hot water burn.',
	machine: 'Rotating chucks and hot chips: no gloves near a turning chuck, guards closed, eye protection on.',
	paint: 'Coatings and solvents: ventilation and a respirator as the coating maker requires.',
	balance: 'Rotating assembly at speed: keep the guard closed, never exceed the maker\'s speed, and stand clear of the plane of rotation.'
};
