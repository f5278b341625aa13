/**
 * The request schema of POST /api/waves/{id}/audits (`{ settings }`, unknown keys refused).
 *
 * Re-exported only: the settings table generates it (src/lib/audit/settings-schema.ts,
 * docs/decisions/006), for the API and the command line alike.
 */
export { auditRequestSchema } from '../../audit/settings-schema';
