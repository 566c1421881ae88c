import type { ReactNode } from 'react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { BrowserRouter, Navigate, Outlet, Route, Routes, useLocation } from 'react-router-dom';
import { ApiError } from './api/client';
import { AuthProvider } from './auth/AuthProvider';
import { RequireAuth, RequireRole } from './auth/guards';
import { AppShell } from './components/AppShell';
import { HealthFooter } from './components/HealthFooter';
import { NAV_ITEMS, SUB_ROUTES } from './nav/navigation';
import { ComingLater } from './pages/ComingLater';
import { FigurePage } from './pages/FigurePage';
import { LibraryPage } from './pages/LibraryPage';
import { NotFound } from './pages/NotFound';
import { PublicationsPage } from './pages/PublicationsPage';
import { SignInPage } from './pages/SignInPage';
import { ForgotPasswordPage, SetPasswordPage } from './pages/SetPasswordPage';
import { PeoplePage } from './admin/PeoplePage';
import { PublicationAdminPage, PublicationsAdminPage } from './admin/PublicationsAdminPage';
import { UploadPage } from './pages/UploadPage';
import { HouseStylePage } from './review/HouseStylePage';
import { DeliveryProfilePage } from './print/DeliveryProfilePage';
import { ProofPage } from './review/ProofPage';
import { ReviewDeskPage } from './review/ReviewDeskPage';
import { SwatchbookPage } from './swatchbooks/SwatchbookPage';
import { SwatchbooksPage } from './swatchbooks/SwatchbooksPage';
import { StudioPage } from './studio/StudioPage';
import { FigureSetsPage } from './sets/FigureSetsPage';

export function createQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        // A 4xx will not change by asking again; a dropped connection might.
        retry: (count, err) => count < 2 && !(err instanceof ApiError && err.status >= 400 && err.status < 500),
        refetchOnWindowFocus: false,
      },
      mutations: { retry: false },
    },
  });
}

export function AppProviders({ client, children }: { client: QueryClient; children: ReactNode }) {
  return (
    <QueryClientProvider client={client}>
      <AuthProvider>{children}</AuthProvider>
    </QueryClientProvider>
  );
}

const BUILT: Record<string, () => ReactNode> = {
  '/publications': () => <PublicationsPage />,
  '/library': () => <LibraryPage />,
  '/review': () => <ReviewDeskPage />,
  '/composer': () => <StudioPage />,
  '/swatchbooks': () => <SwatchbooksPage />,
  '/sets': () => <FigureSetsPage />,
  '/people': () => <PeoplePage />,
  '/manage/publications': () => <PublicationsAdminPage />,
};

/** Pages reached from the places (not in the navigation); SUB_ROUTES says who may open them. */
const SUB_PAGES: Record<string, () => ReactNode> = {
  '/publications/:publicationId/figures': () => <LibraryPage />,
  '/figures/new': () => <ToComposer />,
  '/figures/:figureId': () => <FigurePage />,
  '/figures/:figureId/studio': () => <StudioPage />,
  '/uploads/new': () => <UploadPage />,
  '/figures/:figureId/proof': () => <ProofPage />,
  '/swatchbooks/:swatchbookId': () => <SwatchbookPage />,
  '/publications/:publicationId/house-style': () => <HouseStylePage />,
  '/manage/publications/:publicationId': () => <PublicationAdminPage />,
  '/publications/:publicationId/delivery-profile': () => <DeliveryProfilePage />,
};

/** The one way to make a figure is the Composer; the old address keeps working (with its ?publicationId=). */
function ToComposer() {
  const { search } = useLocation();
  return <Navigate to={`/composer${search}`} replace />;
}

function Frame() {
  return (
    <div className="pf-frame">
      <Outlet />
      <HealthFooter />
    </div>
  );
}

/** All routes; the router itself is supplied by the caller (BrowserRouter in the app, MemoryRouter in tests). */
export function AppRoutes() {
  return (
    <Routes>
      <Route element={<Frame />}>
        <Route path="/sign-in" element={<SignInPage />} />
        <Route path="/set-password" element={<SetPasswordPage />} />
        <Route path="/forgot-password" element={<ForgotPasswordPage />} />
        <Route
          element={
            <RequireAuth>
              <AppShell />
            </RequireAuth>
          }
        >
          <Route index element={<Navigate to="/publications" replace />} />
          {NAV_ITEMS.map((item) => (
            <Route
              key={item.path}
              path={item.path}
              element={
                <RequireRole roles={item.roles} what={item.label}>
                  {item.ready && BUILT[item.path] ? BUILT[item.path]() : <ComingLater item={item} />}
                </RequireRole>
              }
            />
          ))}
          {SUB_ROUTES.map((r) => (
            <Route
              key={r.path}
              path={r.path}
              element={
                <RequireRole roles={r.roles} what={r.label}>
                  {SUB_PAGES[r.path]()}
                </RequireRole>
              }
            />
          ))}
          <Route path="*" element={<NotFound />} />
        </Route>
      </Route>
    </Routes>
  );
}

export function App({ client }: { client: QueryClient }) {
  return (
    <AppProviders client={client}>
      <BrowserRouter>
        <AppRoutes />
      </BrowserRouter>
    </AppProviders>
  );
}
