import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { Router } from '@angular/router';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { normaliseTrayCode } from '../../../shared/schemas/trays';
import type { AppError } from '../errors/app-error';
import { TrayApi } from './tray-api';

/** `/tray`: the short code printed under the QR code on a tray label, typed by hand. */
@Component({
  selector: 'app-tray-code',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule],
  template: `
    <main class="code-page">
      <h1>Open your tray</h1>
      <p>Type the code printed under the square code on your tray label.</p>
      <form (ngSubmit)="open()">
        <mat-form-field>
          <mat-label>Tray code</mat-label>
          <input
            matInput
            [formControl]="code"
            autocomplete="off"
            autocapitalize="characters"
            spellcheck="false"
            placeholder="ABCD-1234"
          />
          @if (code.hasError('pattern') || code.hasError('required')) {
            <mat-error>A tray code has 8 letters and digits, like ABCD-1234.</mat-error>
          }
        </mat-form-field>
        @if (problem(); as p) {
          <p class="problem" role="alert">{{ p }}</p>
        }
        <button mat-flat-button type="submit" [disabled]="busy()">Open the tray</button>
      </form>
    </main>
  `,
  styles: `
    .code-page {
      max-width: 28rem;
      margin: 0 auto;
      padding: 16px;
    }
    mat-form-field {
      width: 100%;
    }
    input {
      font-size: 1.4rem;
      letter-spacing: 0.1em;
    }
    button {
      min-height: 48px;
      width: 100%;
    }
    .problem {
      padding: 8px;
      border-radius: 4px;
      background: #fde8e8;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TrayCode {
  private readonly api = inject(TrayApi);
  private readonly router = inject(Router);

  protected readonly code = new FormControl('', {
    nonNullable: true,
    validators: [
      Validators.required,
      (c) => (/^[0-9A-Z]{8}$/.test(normaliseTrayCode(c.value ?? '')) ? null : { pattern: true }),
    ],
  });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);

  protected open(): void {
    this.code.markAsTouched();
    if (this.code.invalid || this.busy()) return;
    this.busy.set(true);
    this.problem.set(null);
    this.api.tokenOfCode(normaliseTrayCode(this.code.value)).subscribe({
      next: ({ token }) => void this.router.navigate(['/tray', token]),
      error: (err: AppError) => {
        this.busy.set(false);
        this.problem.set(err.message);
      },
    });
  }
}
