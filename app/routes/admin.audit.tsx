import type { Route } from "./+types/admin.audit";
import { requireRole } from "~/utils/auth.server";
import { recentAudit } from "~/services/audit.server";

export async function loader({ request, context }: Route.LoaderArgs) {
  const admin = await requireRole(context, "admin");
  return { entries: await recentAudit(admin.organisationId) };
}

export default function AdminAudit({ loaderData }: Route.ComponentProps) {
  return (
    <div className="flex flex-col gap-4">
      <title>Audit log · Duskline</title>
      <h1>Audit log</h1>
      <p className="text-sm text-night-400">The latest 200 changes in your organisation, newest first. Times are UTC.</p>
      <div className="card overflow-x-auto">
        <table>
          <thead>
            <tr>
              <th scope="col">When (UTC)</th>
              <th scope="col">Who</th>
              <th scope="col">What</th>
              <th scope="col">Record</th>
              <th scope="col">Detail</th>
            </tr>
          </thead>
          <tbody>
            {loaderData.entries.map((e) => (
              <tr key={e.id}>
                <td className="figure whitespace-nowrap">{e.at.replace("T", " ").slice(0, 19)}</td>
                <td>{e.who}</td>
                <td>{e.action}</td>
                <td className="figure">
                  {e.entity} {e.entityId}
                </td>
                <td className="figure text-xs">{e.detail ? JSON.stringify(e.detail) : ""}</td>
              </tr>
            ))}
          </tbody>
        </table>
        {loaderData.entries.length === 0 && <p className="py-4 text-night-400">Nothing recorded yet.</p>}
      </div>
    </div>
  );
}
