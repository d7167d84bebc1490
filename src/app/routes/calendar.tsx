import { CalendarRoute } from '../../features/calendar/routes/calendar';

export default function CalendarPage() {
  return <CalendarRoute />;
}
