/**
 * arcsift's exit statuses: 0 a finished run; 1 an internal fault; 2 a user mistake (nothing was
 * run, or nothing half-written is left); 3 a run a limit cut short (its summary says
 * finished: false); 4 a run stopped by SIGTERM or SIGINT after writing its last checkpoint.
 */
export const EXIT_STATUS = Object.freeze({ finished: 0, internalFault: 1, userMistake: 2, unfinished: 3, interrupted: 4 });
