/**
 * Where the demo scenario lives and how it is made, for both the desktop shell and the browser mode.
 */
/** Generates the demo scenario into `root` (the generator lives in ./scenario). */
export async function generateDemoScenario(
  root: string, onProgress: (fraction: number, message: string) => void,
): Promise<void> {
  const { writeScenario } = await import('./scenario');
  await writeScenario(root, { onProgress });
}
