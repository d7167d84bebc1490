import { lazy, Suspense, type ComponentType, type ReactNode } from 'react';
import { createBrowserRouter, Navigate, RouterProvider, type RouteObject } from 'react-router-dom';
import { LoadingBlock } from '../components/ui/spinner';
import { useMe } from '../features/auth/api/get-me';
import { homePathFor } from '../features/auth/home-path';
import { RequireAuth, RequireRole } from './guards';
import { RouteError } from './route-error';
import { NotFoundScreen } from './routes/not-found';

// Each screen is its own chunk, loaded when first opened.
const SignIn = lazy(() => import('./routes/sign-in'));
const SignUp = lazy(() => import('./routes/sign-up'));
const ForgotPassword = lazy(() => import('./routes/forgot-password'));
const ResetPassword = lazy(() => import('./routes/reset-password'));
const Invite = lazy(() => import('./routes/invite'));
const Studios = lazy(() => import('./routes/studios'));
const Account = lazy(() => import('./routes/account'));
const StudioLayout = lazy(() => import('./routes/studio-layout'));
const StudioHome = lazy(() => import('./routes/studio-home'));
const Clients = lazy(() => import('./routes/clients'));
const ClientNew = lazy(() => import('./routes/client-new'));
const ClientDetail = lazy(() => import('./routes/client-detail'));
const Team = lazy(() => import('./routes/team'));
const Settings = lazy(() => import('./routes/settings'));
const StudioNotFound = lazy(() => import('./routes/studio-not-found'));
const PublicStudio = lazy(() => import('./routes/public-studio'));
const Enquiries = lazy(() => import('./routes/enquiries'));
const EnquiryDetail = lazy(() => import('./routes/enquiry-detail'));
const Paints = lazy(() => import('./routes/paints'));
const PaintNew = lazy(() => import('./routes/paint-new'));
const PaintEdit = lazy(() => import('./routes/paint-edit'));
const PaintsImport = lazy(() => import('./routes/paints-import'));
const Recipes = lazy(() => import('./routes/recipes'));
const RecipeNew = lazy(() => import('./routes/recipe-new'));
const RecipeDetail = lazy(() => import('./routes/recipe-detail'));
const Palette = lazy(() => import('./routes/palette'));
const Commissions = lazy(() => import('./routes/commissions'));
const CommissionNew = lazy(() => import('./routes/commission-new'));
const CommissionDetail = lazy(() => import('./routes/commission-detail'));
const Bench = lazy(() => import('./routes/bench'));
const Money = lazy(() => import('./routes/money'));
const Calendar = lazy(() => import('./routes/calendar'));
const Capacity = lazy(() => import('./routes/capacity'));
const Reports = lazy(() => import('./routes/reports'));
const Prices = lazy(() => import('./routes/prices'));
const Quotes = lazy(() => import('./routes/quotes'));
const QuoteDetail = lazy(() => import('./routes/quote-detail'));
const CommissionQuotes = lazy(() => import('./routes/commission-quotes'));
const Invoices = lazy(() => import('./routes/invoices'));
const InvoiceDetail = lazy(() => import('./routes/invoice-detail'));
const InvoicePaid = lazy(() => import('./routes/invoice-paid'));
const InvoiceNew = lazy(() => import('./routes/invoice-new'));
const CommissionCancel = lazy(() => import('./routes/commission-cancel'));

function screen(Screen: ComponentType): ReactNode {
  return (
    <Suspense fallback={<LoadingBlock />}>
      <Screen />
    </Suspense>
  );
}

/** "/" goes wherever the person belongs: their studio, the chooser, or sign-in. */
function HomeRedirect() {
  const me = useMe();
  if (me.isPending) return <LoadingBlock />;
  if (!me.data) return <Navigate to="/sign-in" replace />;
  return <Navigate to={homePathFor(me.data)} replace />;
}

const STAFF = ['owner', 'painter'] as const;
const OWNER = ['owner'] as const;
const MONEY = ['owner', 'client'] as const;

export const routes: RouteObject[] = [
  {
    errorElement: <RouteError />,
    children: [
      { path: '/', element: <HomeRedirect /> },
      { path: '/sign-in', element: screen(SignIn) },
      { path: '/sign-up', element: screen(SignUp) },
      { path: '/forgot-password', element: screen(ForgotPassword) },
      { path: '/reset-password/:token', element: screen(ResetPassword) },
      { path: '/invite/:token', element: screen(Invite) },
      // A studio's public page for visitors, outside the signed-in screens.
      { path: '/s/:slug', element: screen(PublicStudio) },
      {
        element: <RequireAuth />,
        children: [
          { path: '/studios', element: screen(Studios) },
          { path: '/account', element: screen(Account) },
          {
            path: '/studio/:studioId',
            element: screen(StudioLayout),
            children: [
              { index: true, element: <StudioHome /> },
              {
                path: 'clients',
                element: <RequireRole roles={STAFF} />,
                children: [
                  { index: true, element: <Clients /> },
                  { path: 'new', element: <RequireRole roles={OWNER}><ClientNew /></RequireRole> },
                  { path: ':clientId', element: <ClientDetail /> },
                ],
              },
              {
                path: 'commissions',
                children: [
                  { index: true, element: <Commissions /> },
                  { path: 'new', element: <RequireRole roles={OWNER}><CommissionNew /></RequireRole> },
                  { path: ':commissionId', element: <CommissionDetail /> },
                ],
              },
              { path: 'bench', element: <RequireRole roles={STAFF}><Bench /></RequireRole> },
              {
                path: 'paints',
                element: <RequireRole roles={STAFF} />,
                children: [
                  { index: true, element: <Paints /> },
                  { path: 'new', element: <PaintNew /> },
                  { path: 'import', element: <PaintsImport /> },
                  { path: 'recipes', element: <Recipes /> },
                  { path: 'recipes/new', element: <RecipeNew /> },
                  { path: 'recipes/:recipeId', element: <RecipeDetail /> },
                  { path: 'palette/:photoId', element: <Palette /> },
                  { path: ':paintId', element: <PaintEdit /> },
                ],
              },
              {
                path: 'enquiries',
                element: <RequireRole roles={OWNER} />,
                children: [
                  { index: true, element: <Enquiries /> },
                  { path: ':enquiryId', element: <EnquiryDetail /> },
                ],
              },
              // Money: owners see everything; a client their own quotes and invoices; painters none of it.
              { path: 'money', element: <RequireRole roles={OWNER}><Money /></RequireRole> },
              { path: 'calendar', element: <RequireRole roles={STAFF}><Calendar /></RequireRole> },
              { path: 'calendar/capacity', element: <RequireRole roles={STAFF}><Capacity /></RequireRole> },
              { path: 'reports', element: <RequireRole roles={OWNER}><Reports /></RequireRole> },
              { path: 'money/prices', element: <RequireRole roles={OWNER}><Prices /></RequireRole> },
              { path: 'commissions/:commissionId/quotes', element: <RequireRole roles={OWNER}><CommissionQuotes /></RequireRole> },
              { path: 'commissions/:commissionId/cancel', element: <RequireRole roles={OWNER}><CommissionCancel /></RequireRole> },
              {
                path: 'quotes',
                element: <RequireRole roles={MONEY} />,
                children: [
                  { index: true, element: <Quotes /> },
                  { path: ':quoteId', element: <QuoteDetail /> },
                ],
              },
              {
                path: 'invoices',
                element: <RequireRole roles={MONEY} />,
                children: [
                  { index: true, element: <Invoices /> },
                  { path: 'new', element: <RequireRole roles={OWNER}><InvoiceNew /></RequireRole> },
                  { path: ':invoiceId', element: <InvoiceDetail /> },
                  { path: ':invoiceId/paid', element: <InvoicePaid /> },
                ],
              },
              { path: 'team', element: <RequireRole roles={OWNER}><Team /></RequireRole> },
              { path: 'settings', element: <RequireRole roles={OWNER}><Settings /></RequireRole> },
              { path: '*', element: <StudioNotFound /> },
            ],
          },
        ],
      },
      { path: '*', element: <NotFoundScreen /> },
    ],
  },
];

const router = createBrowserRouter(routes);

export function AppRouter() {
  return <RouterProvider router={router} />;
}
