/** Exit codes shared by every command; scripts in data pipelines branch on them. */
export const EXIT_OK = 0;
/** Input read fine but has transition violations. */
export const EXIT_VIOLATIONS = 1;
/** Input is malformed or unreadable, or the command line itself is wrong. */
export const EXIT_BAD_INPUT = 2;
