import { ROLE_LABELS, ROLES, type Role } from "../../shared/roles";

/** A select of roles with their labels (all roles, or the ones given). */
export function RoleSelect({ id, defaultValue, roles = ROLES, disabled }: { id: string; defaultValue: Role; roles?: readonly Role[]; disabled?: boolean }) {
  return (
    <select id={id} name="role" defaultValue={defaultValue} disabled={disabled}>
      {roles.map((r) => (
        <option key={r} value={r}>
          {ROLE_LABELS[r]}
        </option>
      ))}
    </select>
  );
}
