/**
 * Invented names for seeded people: a given name and a family name drawn independently from
 * two lists, so no row describes a real person. E-mail addresses are firstname.lastname at the
 * organisation's reserved .test domain (RFC 2606, IETF 1999), made unique with a number.
 */
import type { Prng } from "./prng";

export const GIVEN_NAMES = [
  "Adaeze", "Aiden", "Alma", "Amara", "Anders", "Anika", "Arjun", "Aurelio", "Beatriz", "Bennett",
  "Bianca", "Calloway", "Camille", "Cedric", "Celeste", "Dario", "Delphine", "Desmond", "Elif", "Emeka",
  "Esme", "Farida", "Felix", "Freya", "Gaspard", "Greta", "Hamza", "Harriet", "Hollis", "Ines",
  "Isidore", "Jalen", "Juniper", "Kai", "Kamala", "Keziah", "Lachlan", "Leonie", "Linnea", "Lucian",
  "Mairead", "Malik", "Marisol", "Matteo", "Mireille", "Nadia", "Nikolai", "Noor", "Oluwaseun", "Orla",
  "Pavel", "Perpetua", "Quentin", "Rafaela", "Ravi", "Rosalind", "Saoirse", "Selim", "Signe", "Solveig",
  "Tamsin", "Tobias", "Ulrike", "Valentina", "Wendell", "Ximena", "Yusuf", "Zainab", "Zora", "Ezra",
] as const;

export const FAMILY_NAMES = [
  "Abernathy", "Achterberg", "Adeyemi", "Albright", "Amundsen", "Arkwright", "Bachmann", "Balogun", "Barraclough", "Belvedere",
  "Brannigan", "Castellanos", "Cavendish", "Chukwu", "Corrigan", "Dalgleish", "Delacroix", "Draycott", "Eberhardt", "Ellingsen",
  "Esposito", "Fairweather", "Ferreira", "Fitzgerald", "Gallagher", "Grimaldi", "Halloran", "Haverford", "Ibarra", "Iwasaki",
  "Jablonski", "Kaczmarek", "Kavanagh", "Kowalczyk", "Lindqvist", "Lockhart", "Marchetti", "Mbeki", "Montgomery", "Nakashima",
  "Nwachukwu", "Oyelaran", "Pemberton", "Petrakis", "Quintero", "Rasmussen", "Ravenscroft", "Rosenthal", "Saltonstall", "Santangelo",
  "Sorensen", "Strickland", "Tanaka", "Thorvaldsen", "Underhill", "Valdivia", "Vasquez", "Wainwright", "Whitcombe", "Yamamoto",
  "Zielinski", "Ortega", "Halvorsen", "Okonkwo", "Brightwater", "Kingsley", "Larkspur", "Mendoza", "Novak", "Ashdown",
] as const;

/** Lower-case ASCII letters only, for the local part of an address ("Ximena" → "ximena"). */
export function addressPart(name: string): string {
  return name
    .normalize("NFD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z]/g, "");
}

export type GeneratedName = { given: string; family: string; name: string; email: string };

/**
 * Draws names and hands out unique addresses within one domain. `taken` starts with addresses
 * already used (the demo accounts) so a drawn name never collides with them.
 */
export function createNamer(prng: Prng, domain: string, taken: Iterable<string> = []) {
  const used = new Set(Array.from(taken, (e) => e.toLowerCase()));
  return function nextName(): GeneratedName {
    const given = prng.pick(GIVEN_NAMES);
    const family = prng.pick(FAMILY_NAMES);
    const base = `${addressPart(given)}.${addressPart(family)}`;
    let email = `${base}@${domain}`;
    for (let n = 2; used.has(email); n++) email = `${base}${n}@${domain}`;
    used.add(email);
    return { given, family, name: `${given} ${family}`, email };
  };
}
