export function cliBuild(): Promise<void>;
