import { customType } from 'drizzle-orm/pg-core';

/** Binary file contents (photos, attachments) stored in PostgreSQL. */
export const bytea = customType<{ data: Buffer; driverData: Buffer }>({
  dataType: () => 'bytea',
});
