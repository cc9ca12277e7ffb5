import { Form, Link } from "react-router";
import type { Route } from "./+types/devices";
import { hasRole, requireUser } from "~/utils/auth.server";
import { compareDeviceProfiles, deviceProfileJson, listDeviceProfiles } from "~/services/devices.server";
import { harvestDescription } from "../../lib/engine/harvest-points";
import { DeviceComparison } from "~/components/device-comparison";

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  const devices = (await listDeviceProfiles(user.organisationId)).map(deviceProfileJson);
  const compare = compareDeviceProfiles(devices, new URL(request.url).searchParams.getAll("compare"));
  return { devices, compare, canEdit: hasRole(user, ["engineer"]) };
}

export default function Devices({ loaderData }: Route.ComponentProps) {
  const { devices, canEdit, compare } = loaderData;
  const chosen = new Set(compare.map((c) => c.id));
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
      <Form method="get" className="card flex flex-col gap-3">
        <div className="overflow-x-auto">
          <table>
            <thead>
              <tr>
                <th scope="col">Compare</th>
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
                    <input type="checkbox" name="compare" value={d.id} defaultChecked={chosen.has(d.id)} aria-label={`Compare ${d.name}`} />
                  </td>
                  <td>
                    <Link to={`/devices/${d.id}`}>{d.name}</Link>
                  </td>
                  <td className="figure">{d.spec.minCurrentA} A</td>
                  <td className="figure">{d.spec.loadW} W</td>
                  <td className="figure">{d.spec.storageWh} Wh</td>
                  <td className="figure text-xs">{harvestDescription(d.spec)}</td>
                  <td className="figure">{d.spec.lifeYears} y</td>
                  <td>{d.retired ? "Retired" : "In use"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        {devices.length === 0 && <p className="py-3 text-night-400">No device profiles yet.</p>}
        {devices.length > 1 && (
          <button type="submit" className="btn-quiet self-start">
            Compare the ticked curves
          </button>
        )}
      </Form>
      {compare.length > 0 && <DeviceComparison devices={compare} />}
    </div>
  );
}
