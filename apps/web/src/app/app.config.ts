import {
  provideHttpClient,
  withInterceptors,
  withXsrfConfiguration,
} from '@angular/common/http';
import {
  ApplicationConfig,
  inject,
  provideAppInitializer,
  provideBrowserGlobalErrorListeners,
} from '@angular/core';
import { MatIconRegistry } from '@angular/material/icon';
import { provideRouter, withComponentInputBinding } from '@angular/router';

import { routes } from './app.routes';
import { Auth } from './core/auth/auth';
import { errorInterceptor } from './core/error-handler';
import { loadingInterceptor } from './core/loading/loading';

export const appConfig: ApplicationConfig = {
  providers: [
    provideBrowserGlobalErrorListeners(),
    // XHR (not fetch) stays the backend: file uploads will need its progress events.
    provideHttpClient(
      withInterceptors([loadingInterceptor, errorInterceptor]),
      withXsrfConfiguration({ cookieName: 'XSRF-TOKEN', headerName: 'X-XSRF-TOKEN' }),
    ),
    provideRouter(routes, withComponentInputBinding()),
    provideAppInitializer(() => {
      // The icon font ships with the app; its class is defined in styles.scss.
      inject(MatIconRegistry).setDefaultFontSetClass('material-symbols-outlined');
      return inject(Auth).restore();
    }),
  ],
};
