import { randomUUID } from "node:crypto";
import type { DataSource } from "typeorm";
import { hashPassword } from "../auth/passwords";
import { User } from "../entities";
import type { Role } from "../../shared/roles";

/** The demo scenario: Brackwater Radio Works, a small maker of VHF marine telemetry radios (invented). */
export const DEMO_COMPANY = "Brackwater Radio Works";
export const DEMO_PASSWORD = "brackwater-demo-2026";

export const DEMO_PEOPLE: ReadonlyArray<{ email: string; name: string; roles: Role[] }> = [
  { email: "ines.okafor@brackwater.example", name: "Ines Okafor", roles: ["admin"] },
  { email: "tomas.reyes@brackwater.example", name: "Tomas Reyes", roles: ["designer"] },
  { email: "priya.lund@brackwater.example", name: "Priya Lund", roles: ["planner"] },
  { email: "mateo.sato@brackwater.example", name: "Mateo Sato", roles: ["analyst"] },
  { email: "greta.holm@brackwater.example", name: "Greta Holm", roles: ["reviewer"] },
];

/** Adds the demo people that are missing; running it again adds nothing. Returns how many were added. */
export async function seedDemo(dataSource: DataSource): Promise<number> {
  const repo = dataSource.getRepository(User);
  let added = 0;
  for (const person of DEMO_PEOPLE) {
    if (await repo.existsBy({ email: person.email })) continue;
    await repo.insert({ id: randomUUID(), ...person, passwordHash: await hashPassword(DEMO_PASSWORD), active: true });
    added += 1;
  }
  return added;
}
