import { Link } from "react-router";
import type { Route } from "./+types/devices";
import { hasRole, requireUser } from "~/utils/auth.server";
import { deviceProfileJson, listDeviceProfiles } from "~/services/devices.server";

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  return { devices: (await listDeviceProfiles(user.organisationId)).map(deviceProfileJson), canEdit: hasRole(user, ["engineer"]) };
}

export default function Devices({ loaderData }: Route.ComponentProps) {
  const { devices, canEdit } = loaderData;
  return (
    <div className="flex flex-col gap-4">
      <title>Device profiles · Duskline</title>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1>Device profiles</h1>
        {canEdit && (
          <Link to="/devices/new" className="btn">
            New device profile
          </Link>
        )}
      </div>
      <div className="card overflow-x-auto">
        <table>
          <thead>
            <tr>
              <th scope="col">Device profile</th>
              <th scope="col">Min current</th>
              <th scope="col">Load</th>
              <th scope="col">Storage</th>
              <th scope="col">Harvest (W)</th>
              <th scope="col">Life</th>
              <th scope="col">Status</th>
            </tr>
          </thead>
          <tbody>
            {devices.map((d) => (
              <tr key={d.id} className={d.retired ? "opacity-60" : ""}>
                <td>
                  <Link to={`/devices/${d.id}`}>{d.name}</Link>
                </td>
                <td className="figure">{d.spec.minCurrentA} A</td>
                <td className="figure">{d.spec.loadW} W</td>
                <td className="figure">{d.spec.storageWh} Wh</td>
                <td className="figure text-xs">{d.spec.harvestW}</td>
                <td className="figure">{d.spec.lifeYears} y</td>
                <td>{d.retired ? "Retired" : "In use"}</td>
              </tr>
            ))}
          </tbody>
        </table>
        {devices.length === 0 && <p className="py-3 text-night-400">No device profiles yet.</p>}
      </div>
    </div>
  );
}
