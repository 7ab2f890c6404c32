// Importing this module registers every job processor (one file per job).
import './compute-water-test.processor';
