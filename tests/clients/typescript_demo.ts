// Calling Faultpath from TypeScript: types from openapi-typescript, requests with openapi-fetch.
//
//   npx openapi-typescript schemas/openapi.json -o faultpath.d.ts --default-non-nullable false
//   FAULTPATH_URL=http://127.0.0.1:8000 FAULTPATH_KEY=... npx tsx typescript_demo.ts
//
// --default-non-nullable false: a field with a default (bonding_complete, cpc_arrangement ...) stays optional
// in requests. The README shows this file; the test suite type-checks it and runs it against a live service.
import { readFileSync } from "node:fs";
import createClient from "openapi-fetch";
import type { components, paths } from "./faultpath";

const examples = process.env.FAULTPATH_EXAMPLES ?? "schemas/examples";
const example = <T>(name: string): T => JSON.parse(readFileSync(`${examples}/${name}`, "utf8")) as T;
const client = createClient<paths>({
  baseUrl: process.env.FAULTPATH_URL,
  headers: { "X-API-Key": process.env.FAULTPATH_KEY ?? "" },
});

type CheckRequest = components["schemas"]["CheckRequest"];

async function main(): Promise<void> {
  // one circuit
  const one = await client.POST("/v1/circuits/check", { body: example<CheckRequest>("circuits-check.json") });
  if (!one.data) throw new Error(`check failed: ${JSON.stringify(one.error)}`);
  console.log("check:", one.data.id, one.data.verdict, "Zs", one.data.zs_ohm, "ohm");

  // a batch with one bad item: the lean table, one cell per circuit; the bad one is a problem in its place
  const batch = await client.POST("/v1/circuits/check-batch", {
    body: example<components["schemas"]["BatchRequest"]>("circuits-check-batch.json"),
  });
  const answer = batch.data;
  if (typeof answer !== "object" || !("columns" in answer)) throw new Error("batch failed");
  const { columns, problems } = answer;
  columns.verdict.forEach((verdict, i) => {
    const at = columns.problem[i];
    const pointer = typeof at === "number" ? problems[at].problem.errors[0].pointer : "";
    console.log("batch:", columns.index[i], verdict, pointer);
  });

  // sizing
  const sized = await client.POST("/v1/circuits/size", {
    body: example<components["schemas"]["SizeRequest"]>("circuits-size.json"),
  });
  if (!sized.data) throw new Error("size failed");
  console.log("size:", sized.data.device.rating_a, "A,", sized.data.selected?.line_csa_mm2, "mm2");

  // a 422, read as a problem
  const bad = example<CheckRequest>("circuits-check.json");
  bad.supply.u0_v = 20;
  const refused = await client.POST("/v1/circuits/check", { body: bad });
  const problem = refused.error as components["schemas"]["Problem"];
  console.log("problem:", refused.response.status, problem.errors[0].pointer, problem.errors[0].message);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
