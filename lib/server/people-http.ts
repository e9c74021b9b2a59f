import { PeopleError } from "./invitations";
import { jsonError } from "./route";

/** Runs a people action and turns its expected refusals into the API's error answers. */
export async function answerPeople(work: () => Promise<Response>): Promise<Response> {
  try {
    return await work();
  } catch (err) {
    if (err instanceof PeopleError) return jsonError(err.status, err.message, err.fields, err.headers);
    throw err;
  }
}
