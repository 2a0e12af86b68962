import "server-only";
import type { Role } from "../schema";

// The invented people of the demo scenario. Every demo sign-in shares one password.
export const DEMO_PASSWORD = "trench-demo-2026";
export const DEMO_REGION = "Sandhollow Valley";

export interface DemoUser {
  key: string;
  email: string;
  name: string;
  role: Role;
}

export const DEMO_USERS: DemoUser[] = [
  { key: "admin", email: "admin@trenchbook.test", name: "Priya Anand", role: "admin" },
  { key: "supervisor", email: "renata@trenchbook.test", name: "Renata Vukovic", role: "supervisor" },
  { key: "rep1", email: "marisol@trenchbook.test", name: "Marisol Quintero", role: "rep" },
  { key: "rep2", email: "dale@trenchbook.test", name: "Dale Okafor", role: "rep" },
  { key: "grower1", email: "tom@aldercreek.test", name: "Tom Haskell", role: "grower" },
  { key: "grower2", email: "june@bellweather.test", name: "June Park", role: "grower" },
  { key: "grower3", email: "luis@cottonwoodbend.test", name: "Luis Ferreira", role: "grower" },
  { key: "grower4", email: "hank@drywash.test", name: "Hank Moreno", role: "grower" },
];
