// Types of scripts/migrations.mjs (plain JavaScript: `npm start` runs it before anything is built).
export function providerOf(url: string | undefined): "sqlite" | "postgres";
export function migrationNames(provider: "sqlite" | "postgres"): string[];
export function appliedMigrations(url: string): Promise<string[]>;
export function pendingMigrations(url: string): Promise<string[]>;
export function armCount(url: string): Promise<number>;
