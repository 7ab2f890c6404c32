import SetupRoute from './setup';

/** People on the farm: the Setup screen opened on its People tab. */
export default function SetupPeopleRoute() {
  return <SetupRoute fixedTab="people" />;
}
