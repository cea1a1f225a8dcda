export function withTables(md: string, catalogue: unknown): string;
