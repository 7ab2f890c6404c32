export { taskLiveEvents, taskQueries } from './api/tasks';
export { TaskBoard } from './components/task-board';
