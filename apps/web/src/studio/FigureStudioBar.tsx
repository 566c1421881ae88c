// On the figure page: the way into the studio (illustrators) and the export dialog (everyone who can read it).
import { useState } from 'react';
import { AnchorButton, Button } from '@blueprintjs/core';
import { useNavigate } from 'react-router-dom';
import type { FigureDto, Recipe } from '@psiform/contracts';
import { useAuth } from '../auth/AuthProvider';
import { ExportDialog } from './ExportDialog';

export function FigureStudioBar({ figure, recipe }: { figure: FigureDto; recipe: Recipe }) {
  const { user } = useAuth();
  const navigate = useNavigate();
  const [open, setOpen] = useState(false);
  const href = `/figures/${encodeURIComponent(figure.id)}/studio`;
  return (
    <div className="pf-studio-bar" data-testid="figure-studio-bar">
      {user?.role === 'illustrator' && recipe.source?.kind !== 'upload' && (
        <AnchorButton
          icon="style"
          text="Open in the studio"
          href={href}
          onClick={(e) => {
            e.preventDefault();
            navigate(href);
          }}
          data-testid="figure-studio-link"
        />
      )}
      <Button icon="export" text="Export…" onClick={() => setOpen(true)} data-testid="figure-export" />
      <ExportDialog isOpen={open} onClose={() => setOpen(false)} figure={figure} canvas={recipe.canvas} transparentDefault={recipe.stage.background.transparent} />
    </div>
  );
}
