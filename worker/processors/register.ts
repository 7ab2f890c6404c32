// Importing this module registers every job processor (one file per job).
import './compute-water-test.processor';
import './recommend-feed.processor';
import './evaluate-unit.processor';
import './sweep-farms.processor';
import './escalate-alerts.processor';
import './notify-alert.processor';
import './morning-report.processor';
