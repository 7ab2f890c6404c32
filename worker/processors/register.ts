// Importing this module registers every job processor (one file per job).
